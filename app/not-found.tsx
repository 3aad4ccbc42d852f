import Link from "next/link";
import { getLocale, getTranslations } from "next-intl/server";
import { withLanguage } from "@/lib/domain/i18n/language-choice";

/** In the request's language: a public address's `?lang=es`, or the signed-in person's own. */
export default async function NotFound() {
  const [t, locale] = await Promise.all([getTranslations("publicPages"), getLocale()]);
  return (
    <main id="main" className="mx-auto max-w-xl px-4 py-20 text-center">
      <h1 className="text-3xl font-bold">{t("notFoundTitle")}</h1>
      <p className="mt-3 text-loam-700">{t("notFoundText")}</p>
      <p className="mt-6"><Link href={withLanguage("/", locale)}>{t("notFoundHome")}</Link></p>
    </main>
  );
}
