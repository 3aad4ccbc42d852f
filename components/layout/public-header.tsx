import Link from "next/link";
import { Logo } from "./logo";
import { getViewer } from "@/lib/auth/guards";

export async function PublicHeader() {
  const viewer = await getViewer();
  return (
    <header className="border-b border-husk-200 bg-white">
      <div className="mx-auto flex max-w-6xl flex-wrap items-center justify-between gap-3 px-4 py-3">
        <Link href="/" className="no-underline" aria-label="Seedplot home">
          <Logo />
        </Link>
        <nav aria-label="Main" className="flex items-center gap-4 text-base">
          <Link href="/" className="font-semibold no-underline hover:underline">Home</Link>
          <Link href="/results" className="font-semibold no-underline hover:underline">Results</Link>
          {viewer ? (
            <Link href="/portal" className="font-semibold no-underline hover:underline">My portal</Link>
          ) : (
            <Link href="/sign-in" className="font-semibold no-underline hover:underline">Sign in</Link>
          )}
        </nav>
      </div>
    </header>
  );
}

export function PublicFooter() {
  return (
    <footer className="mt-16 border-t border-husk-200 bg-husk-100">
      <div className="mx-auto max-w-6xl px-4 py-6 text-sm text-loam-700">
        Seedplot is run by the Tamarack Valley Extension District with its partner farms and gardens. Trial results
        describe these sites and seasons; check them against your own conditions.
      </div>
    </footer>
  );
}
