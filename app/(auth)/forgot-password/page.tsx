import type { Metadata } from "next";
import Link from "next/link";
import { getLocale, getTranslations } from "next-intl/server";
import { ForgotPasswordForm } from "@/components/auth/password-forms";
import { withLanguage } from "@/lib/domain/i18n/language-choice";

export async function generateMetadata(): Promise<Metadata> {
  return { title: (await getTranslations("auth"))("forgotTitle") };
}

export default async function ForgotPasswordPage() {
  const [t, locale] = await Promise.all([getTranslations("auth"), getLocale()]);
  return (
    <>
      <h1 className="mb-1 text-2xl font-bold">{t("forgotTitle")}</h1>
      <p className="mb-6 text-loam-700">{t("forgotIntro")}</p>
      <ForgotPasswordForm />
      <p className="mt-6 text-sm"><Link href={withLanguage("/sign-in", locale)}>{t("backToSignIn")}</Link></p>
    </>
  );
}
