"use client";
import { useState } from "react";
import { signIn } from "next-auth/react";
import Link from "next/link";
import { TextField } from "@/components/ui/field";
import { Button } from "@/components/ui/button";
import { signInFields } from "@/lib/validation/auth";
import { fieldErrorsOf } from "@/lib/validation/field-errors";
import { useLocale, useTranslations } from "next-intl";
import { withLanguage } from "@/lib/domain/i18n/language-choice";

export function SignInForm({ callbackUrl, notice }: { callbackUrl: string; notice?: string }) {
  const t = useTranslations("auth");
  const check = useTranslations("auth.check");
  const locale = useLocale();
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [fieldErrors, setFieldErrors] = useState<Record<string, string[]>>({});

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const parsed = signInFields((key) => check(key)).safeParse({ email: form.get("email"), password: form.get("password") });
    if (!parsed.success) {
      setFieldErrors(fieldErrorsOf(parsed.error));
      setError(t("correctFields"));
      return;
    }
    setFieldErrors({});
    setError(null);
    setPending(true);
    try {
      // `lang` lets the server answer a refused sign-in in this page's language.
      const result = await signIn("credentials", { ...parsed.data, lang: locale, redirect: false });
      if (!result || result.error) {
        setError(result?.error && result.error !== "CredentialsSignin" ? result.error : t("failed"));
        return;
      }
      window.location.assign(callbackUrl);
    } catch {
      setError(t("unreachable"));
    } finally {
      setPending(false);
    }
  }

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {notice && <p className="rounded-lg bg-sprout-50 px-3 py-2 text-sm font-medium text-sprout-700">{notice}</p>}
      <TextField label={t("email")} name="email" type="email" autoComplete="email" required errors={fieldErrors.email} />
      <TextField label={t("password")} name="password" type="password" autoComplete="current-password" required errors={fieldErrors.password} />
      <div aria-live="polite" role="status">
        {error && <p className="rounded-lg border border-beet-600 bg-beet-50 px-3 py-2 text-sm font-medium text-beet-700">{error}</p>}
      </div>
      <Button type="submit" disabled={pending} className="w-full">
        {pending ? t("signingIn") : t("signIn")}
      </Button>
      <p className="text-center text-sm">
        <Link href={withLanguage("/forgot-password", locale)}>{t("forgot")}</Link>
      </p>
    </form>
  );
}
