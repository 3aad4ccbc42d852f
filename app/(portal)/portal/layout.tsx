import Link from "next/link";
import { Logo } from "@/components/layout/logo";
import { NavLink } from "@/components/layout/nav-link";
import { SignOutButton } from "@/components/layout/sign-out-button";
import { OfflineSetup } from "@/components/offline/offline-setup";
import { requireUser } from "@/server/auth/guards";
import { getTranslations } from "next-intl/server";
import { mailIsCaptured } from "@/server/mail/mailbox";

export default async function PortalLayout({ children }: { children: React.ReactNode }) {
  const viewer = await requireUser();
  const t = await getTranslations("nav");
  const staff = viewer.role !== "cooperator";
  const links: [string, string][] = [["/portal", t("home")], ["/portal/record", t("record")]];
  if (staff) links.push(["/portal/review", t("review")]);
  if (staff) links.push(["/portal/trials", t("trials")], ["/portal/seasons", t("seasons")], ["/portal/sites", t("sites")], ["/portal/catalogue", t("catalogue")], ["/portal/cooperators", t("growers")]);
  if (viewer.role === "admin") links.push(["/portal/admin/users", t("users")]);
  links.push(["/portal/account", t("account")]);
  if (mailIsCaptured()) links.push(["/portal/mailbox", t("mailbox")]);
  return (
    <div className="min-h-screen">
      <header className="no-print border-b border-husk-200 bg-white">
        <div className="mx-auto flex max-w-6xl flex-wrap items-center justify-between gap-3 px-4 py-2">
          <Link href="/portal" className="no-underline" aria-label={t("portalHome")}>
            <Logo />
          </Link>
          <div className="flex items-center gap-3 text-sm">
            <span className="text-loam-700">
              {viewer.name} · <span className="font-semibold">{t("role", { role: viewer.role })}</span>
            </span>
            <SignOutButton userId={viewer.id} />
          </div>
        </div>
        <nav aria-label={t("portal")} className="mx-auto flex max-w-6xl gap-1 overflow-x-auto px-4">
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
