import Link from "next/link";
import { Logo } from "@/components/layout/logo";
import { NavLink } from "@/components/layout/nav-link";
import { SignOutButton } from "@/components/layout/sign-out-button";
import { OfflineSetup } from "@/components/offline/offline-setup";
import { requireUser } from "@/server/auth/guards";
import { ROLE_LABELS } from "@/lib/domain/vocabulary/labels";
import { mailIsCaptured } from "@/server/mail/mailbox";

export default async function PortalLayout({ children }: { children: React.ReactNode }) {
  const viewer = await requireUser();
  const staff = viewer.role !== "cooperator";
  const links: [string, string][] = [["/portal", "Home"], ["/portal/record", "Record data"]];
  if (staff) links.push(["/portal/review", "Review"]);
  if (staff) links.push(["/portal/trials", "Trials"], ["/portal/seasons", "Seasons"], ["/portal/sites", "Sites"], ["/portal/catalogue", "Catalogue"], ["/portal/cooperators", "Growers"]);
  if (viewer.role === "admin") links.push(["/portal/admin/users", "Users & roles"]);
  if (mailIsCaptured()) links.push(["/portal/mailbox", "Test mailbox"]);
  return (
    <div className="min-h-screen">
      <header className="no-print border-b border-husk-200 bg-white">
        <div className="mx-auto flex max-w-6xl flex-wrap items-center justify-between gap-3 px-4 py-2">
          <Link href="/portal" className="no-underline" aria-label="Seedplot portal home">
            <Logo />
          </Link>
          <div className="flex items-center gap-3 text-sm">
            <span className="text-loam-700">
              {viewer.name} · <span className="font-semibold">{ROLE_LABELS[viewer.role]}</span>
            </span>
            <SignOutButton userId={viewer.id} />
          </div>
        </div>
        <nav aria-label="Portal" className="mx-auto flex max-w-6xl gap-1 overflow-x-auto px-4">
          {links.map(([href, label]) => (
            <NavLink
              key={href}
              href={href}
              exact={href === "/portal"}
              className="whitespace-nowrap rounded-t-lg border-b-[3px] px-3 py-2 font-semibold no-underline hover:bg-husk-100"
              activeClassName="border-sprout-600 text-loam-900"
              inactiveClassName="border-transparent text-loam-700"
            >
              {label}
            </NavLink>
          ))}
        </nav>
      </header>
      <OfflineSetup userId={viewer.id} />
      <main id="main" className="mx-auto max-w-6xl px-4 py-8">
        {children}
      </main>
    </div>
  );
}
