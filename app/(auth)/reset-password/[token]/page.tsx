import type { Metadata } from "next";
import Link from "next/link";
import { getLocale, getTranslations } from "next-intl/server";
import { ResetPasswordForm } from "@/components/auth/password-forms";
import { getValidToken } from "@/db/queries/users";
import { hashToken } from "@/server/auth/tokens";
import { tokenSchema } from "@/lib/validation/auth";
import { withLanguage } from "@/lib/domain/i18n/language-choice";

export async function generateMetadata(): Promise<Metadata> {
  return { title: (await getTranslations("auth"))("resetTitle") };
}

export default async function ResetPasswordPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const [t, locale] = await Promise.all([getTranslations("auth"), getLocale()]);
  const valid = tokenSchema.safeParse(token).success ? await getValidToken(hashToken(token), "password_reset") : null;
  if (!valid) {
    return (
      <>
        <h1 className="mb-2 text-2xl font-bold">{t("linkDeadTitle")}</h1>
        <p className="text-loam-700">{t("linkDead")} <Link href={withLanguage("/forgot-password", locale)}>{t("askNewLink")}</Link>.</p>
      </>
    );
  }
  return (
    <>
      <h1 className="mb-1 text-2xl font-bold">{t("resetTitle")}</h1>
      <p className="mb-6 text-loam-700">{t("resetFor", { email: valid.email })}</p>
      <ResetPasswordForm token={token} />
    </>
  );
}
