"use client";

import Link from "next/link";
import { useLocale, useTranslations } from "next-intl";
import { Logo } from "@/components/layout/logo";
import { withLanguage } from "@/lib/domain/i18n/language-choice";

// Catches what the nearer boundaries cannot: a failing layout (the portal layout reads the signed-in
// account from the database) and the sign-in pages. Without it a database outage shows Next's bare error.
export default function AppErrorPage({ retry }: { error: unknown; retry: () => void }) {
  const t = useTranslations("frame");
  const locale = useLocale();
  return (
    <main id="main" role="alert" className="mx-auto max-w-xl px-4 py-16 text-center">
      <Link href={withLanguage("/", locale)} className="inline-block no-underline" aria-label={t("home")}>
        <Logo />
      </Link>
      <h1 className="mt-8 text-2xl font-bold">{t("title")}</h1>
      <p className="mt-2 text-loam-700">{t("appText")}</p>
      <button type="button" onClick={retry} className="mt-6 min-h-11 rounded-lg bg-sprout-600 px-4 font-semibold text-white">
        {t("tryAgain")}
      </button>
    </main>
  );
}
