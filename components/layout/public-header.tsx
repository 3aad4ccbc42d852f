import Link from "next/link";
import { Logo } from "./logo";
import { NavLink } from "./nav-link";

const LINK = "font-semibold";
const CURRENT = "underline decoration-sprout-600 decoration-[3px] underline-offset-8";
const OTHER = "no-underline hover:underline";

/** `signedIn` comes from the layout, which reads the session; the header only chooses the link. */
export function PublicHeader({ signedIn }: { signedIn: boolean }) {
  return (
    <header className="border-b border-husk-200 bg-white">
      <div className="mx-auto flex max-w-6xl flex-wrap items-center justify-between gap-3 px-4 py-3">
        <Link href="/" className="no-underline" aria-label="Seedplot home">
          <Logo />
        </Link>
        <nav aria-label="Main" className="flex items-center gap-4 text-base">
          <NavLink href="/" exact className={LINK} activeClassName={CURRENT} inactiveClassName={OTHER}>
            Home
          </NavLink>
          <NavLink href="/results" className={LINK} activeClassName={CURRENT} inactiveClassName={OTHER}>
            Results
          </NavLink>
          {signedIn ? (
            <Link href="/portal" className={`${LINK} ${OTHER}`}>
              My portal
            </Link>
          ) : (
            <NavLink href="/sign-in" className={LINK} activeClassName={CURRENT} inactiveClassName={OTHER}>
              Sign in
            </NavLink>
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
