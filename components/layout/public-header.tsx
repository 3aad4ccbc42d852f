import Link from "next/link";
import { Logo } from "./logo";
import { useLocale, useTranslations } from "next-intl";
import { Suspense } from "react";
import { NavLink } from "./nav-link";
import { LanguageSwitch } from "./language-switch";
import { withLanguage } from "@/lib/domain/i18n/language-choice";

const LINK = "font-semibold";
const CURRENT = "underline decoration-sprout-600 decoration-[3px] underline-offset-8";
const OTHER = "no-underline hover:underline";

/** `signedIn` comes from the layout, which reads the session; the header only chooses the link. */
export function PublicHeader({ signedIn }: { signedIn: boolean }) {
  const t = useTranslations("nav");
  const locale = useLocale();
  const inLanguage = (href: string) => withLanguage(href, locale);
  return (
    <header className="border-b border-husk-200 bg-white">
      <div className="mx-auto flex max-w-6xl flex-wrap items-center justify-between gap-3 px-4 py-3">
        <Link href={inLanguage("/")} className="no-underline" aria-label={t("seedplotHome")}>
          <Logo />
        </Link>
        <nav aria-label={t("main")} className="flex flex-wrap items-center gap-4 text-base">
          <NavLink href={inLanguage("/")} exact className={LINK} activeClassName={CURRENT} inactiveClassName={OTHER}>
            {t("publicHome")}
          </NavLink>
          <NavLink href={inLanguage("/results")} className={LINK} activeClassName={CURRENT} inactiveClassName={OTHER}>
            {t("results")}
          </NavLink>
          {signedIn ? (
            <Link href="/portal" className={`${LINK} ${OTHER}`}>
              {t("myPortal")}
            </Link>
          ) : (
            <NavLink href={inLanguage("/sign-in")} className={LINK} activeClassName={CURRENT} inactiveClassName={OTHER}>
              {t("signIn")}
            </NavLink>
          )}
          <Suspense>
            <LanguageSwitch />
          </Suspense>
        </nav>
      </div>
    </header>
  );
}

export function PublicFooter() {
  const t = useTranslations("nav");
  return (
    <footer className="mt-16 border-t border-husk-200 bg-husk-100">
      <div className="mx-auto max-w-6xl px-4 py-6 text-sm text-loam-700">
        {t("footer")}
      </div>
    </footer>
  );
}
