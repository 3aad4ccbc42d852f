"use client";

import { usePathname, useSearchParams } from "next/navigation";
import { useLocale, useTranslations } from "next-intl";
import { withLanguage } from "@/lib/domain/i18n/language-choice";

/**
 * The public pages' language switch: the same address with `?lang=es` (or without it for English). The
 * choice lives in the URL, not a cookie, so every cached page is one language and links can be shared.
 */
export function LanguageSwitch() {
  const locale = useLocale();
  const t = useTranslations("public");
  const path = usePathname();
  const search = useSearchParams();
  const other = locale === "en" ? "es" : "en";
  const href = withLanguage(`${path}${search.size > 0 ? `?${search.toString()}` : ""}`, other);
  return (
    // A full page load, not a client transition: the layout (header, <html lang>, the client's messages) must
    // be rendered again in the other language too.
    // eslint-disable-next-line @next/next/no-html-link-for-pages -- see above
    <a href={href} hrefLang={other} lang={other} className="font-semibold no-underline hover:underline">
      {t("switchTo")}
    </a>
  );
}
