import Link from "next/link";
import { getTranslations } from "next-intl/server";

export default async function NotFound() {
  const t = await getTranslations("pageErrors");
  return (
    <main id="main" className="mx-auto max-w-xl px-4 py-20 text-center">
      <h1 className="text-3xl font-bold">{t("notFoundTitle")}</h1>
      <p className="mt-3 text-loam-700">{t("notFoundBody")}</p>
      <p className="mt-6"><Link href="/">{t("notFoundHome")}</Link></p>
    </main>
  );
}
