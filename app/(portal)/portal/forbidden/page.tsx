import Link from "next/link";
import { getTranslations } from "next-intl/server";

export const metadata = { title: "No access" };

export default async function ForbiddenPage() {
  const t = await getTranslations("pageErrors");
  return (
    <div className="rounded-xl border border-marigold-400 bg-marigold-100 p-6">
      <h1 className="text-2xl font-bold">{t("forbiddenTitle")}</h1>
      <p className="mt-2">{t("forbiddenBody")}</p>
      <p className="mt-4"><Link href="/portal">{t("backHome")}</Link></p>
    </div>
  );
}
