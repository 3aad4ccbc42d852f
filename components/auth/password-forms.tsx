"use client";
import { useActionState } from "react";
import { TextField } from "@/components/ui/field";
import { SubmitButton } from "@/components/ui/submit-button";
import { FormMessage } from "@/components/ui/form-message";
import { signIn } from "next-auth/react";
import { acceptInvite, requestPasswordReset, resetPassword } from "@/server/actions/auth";
import type { ActionResult } from "@/lib/validation/action-result";
import { useLocale, useTranslations } from "next-intl";
import { withLanguage } from "@/lib/domain/i18n/language-choice";

export function ForgotPasswordForm() {
  const t = useTranslations("auth");
  const locale = useLocale();
  const [state, action] = useActionState(requestPasswordReset, null);
  const errors = state && !state.ok ? state.fieldErrors : undefined;
  return (
    <form action={action} noValidate className="space-y-4">
      <input type="hidden" name="lang" value={locale} />
      <TextField label={t("email")} name="email" type="email" autoComplete="email" required errors={errors?.email} defaultValue={state && !state.ok ? state.values?.email : undefined} />
      <FormMessage state={state} />
      <SubmitButton pendingText={t("sending")}>{t("sendReset")}</SubmitButton>
    </form>
  );
}

export function ResetPasswordForm({ token }: { token: string }) {
  const t = useTranslations("auth");
  const locale = useLocale();
  const [state, action] = useActionState(resetPassword, null);
  const errors = state && !state.ok ? state.fieldErrors : undefined;
  return (
    <form action={action} noValidate className="space-y-4">
      <input type="hidden" name="lang" value={locale} />
      <input type="hidden" name="token" value={token} />
      <TextField label={t("newPassword")} name="password" type="password" autoComplete="new-password" hint={t("atLeast")} required errors={errors?.password} />
      <TextField label={t("newPasswordAgain")} name="confirm" type="password" autoComplete="new-password" required errors={errors?.confirm} />
      <FormMessage state={state} />
      <SubmitButton>{t("setNewPassword")}</SubmitButton>
    </form>
  );
}

/** Sets the invited person's name and password, then signs them in with it and opens the portal. */
export function AcceptInviteForm({ token, name, email }: { token: string; name: string; email: string }) {
  const t = useTranslations("auth");
  const locale = useLocale();
  const welcome = withLanguage("/sign-in?welcome=1", locale);
  const [state, action] = useActionState<ActionResult | null, FormData>(async (previous, formData) => {
    const result = await acceptInvite(previous, formData);
    if (!result.ok) return result;
    try {
      const signedIn = await signIn("credentials", { email, password: String(formData.get("password") ?? ""), redirect: false });
      // Should the sign-in not go through (a lost connection), the password is set all the same.
      window.location.assign(signedIn?.ok && !signedIn.error ? "/portal" : welcome);
    } catch {
      window.location.assign(welcome);
    }
    return result;
  }, null);
  const errors = state && !state.ok ? state.fieldErrors : undefined;
  return (
    <form action={action} noValidate className="space-y-4">
      <input type="hidden" name="token" value={token} />
      <input type="hidden" name="lang" value={locale} />
      <TextField label={t("yourName")} name="name" autoComplete="name" required defaultValue={(state && !state.ok && state.values?.name) || name} errors={errors?.name} />
      <TextField label={t("choosePassword")} name="password" type="password" autoComplete="new-password" hint={t("atLeast")} required errors={errors?.password} />
      <TextField label={t("passwordAgain")} name="confirm" type="password" autoComplete="new-password" required errors={errors?.confirm} />
      <FormMessage state={state} />
      <SubmitButton>{t("setAndContinue")}</SubmitButton>
    </form>
  );
}
