import type { Metadata } from "next";
import { getTranslations } from "next-intl/server";
import { requireUser } from "@/server/auth/guards";
import { Card } from "@/components/ui/card";
import { LanguageForm } from "@/components/account/language-form";

export async function generateMetadata(): Promise<Metadata> {
  return { title: (await getTranslations("account"))("title") };
}

export default async function AccountPage() {
  const viewer = await requireUser();
  const t = await getTranslations("account");
  return (
    <div className="space-y-6">
      <h1 className="text-3xl font-bold">{t("title")}</h1>
      <p className="text-loam-700">{t("intro")}</p>
      <Card title={t("title")}>
        <dl className="mb-4 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
          <dt className="font-semibold">{t("name")}</dt>
          <dd>{viewer.name}</dd>
          <dt className="font-semibold">{t("email")}</dt>
          <dd>{viewer.email}</dd>
        </dl>
        <LanguageForm current={viewer.locale ?? "en"} />
      </Card>
    </div>
  );
}
