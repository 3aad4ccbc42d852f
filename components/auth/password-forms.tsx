"use client";
import { useActionState } from "react";
import { TextField } from "@/components/ui/field";
import { SubmitButton } from "@/components/ui/submit-button";
import { FormMessage } from "@/components/ui/form-message";
import { signIn } from "next-auth/react";
import { acceptInvite, requestPasswordReset, resetPassword } from "@/server/actions/auth";
import type { ActionResult } from "@/lib/validation/action-result";

export function ForgotPasswordForm() {
  const [state, action] = useActionState(requestPasswordReset, null);
  const errors = state && !state.ok ? state.fieldErrors : undefined;
  return (
    <form action={action} noValidate className="space-y-4">
      <TextField label="E-mail" name="email" type="email" autoComplete="email" required errors={errors?.email} defaultValue={state && !state.ok ? state.values?.email : undefined} />
      <FormMessage state={state} />
      <SubmitButton pendingText="Sending…">Send reset link</SubmitButton>
    </form>
  );
}

export function ResetPasswordForm({ token }: { token: string }) {
  const [state, action] = useActionState(resetPassword, null);
  const errors = state && !state.ok ? state.fieldErrors : undefined;
  return (
    <form action={action} noValidate className="space-y-4">
      <input type="hidden" name="token" value={token} />
      <TextField label="New password" name="password" type="password" autoComplete="new-password" hint="At least 10 characters." required errors={errors?.password} />
      <TextField label="New password again" name="confirm" type="password" autoComplete="new-password" required errors={errors?.confirm} />
      <FormMessage state={state} />
      <SubmitButton>Set new password</SubmitButton>
    </form>
  );
}

/** Sets the invited person's name and password, then signs them in with it and opens the portal. */
export function AcceptInviteForm({ token, name, email }: { token: string; name: string; email: string }) {
  const [state, action] = useActionState<ActionResult | null, FormData>(async (previous, formData) => {
    const result = await acceptInvite(previous, formData);
    if (!result.ok) return result;
    try {
      const signedIn = await signIn("credentials", { email, password: String(formData.get("password") ?? ""), redirect: false });
      // Should the sign-in not go through (a lost connection), the password is set all the same.
      window.location.assign(signedIn?.ok && !signedIn.error ? "/portal" : "/sign-in?welcome=1");
    } catch {
      window.location.assign("/sign-in?welcome=1");
    }
    return result;
  }, null);
  const errors = state && !state.ok ? state.fieldErrors : undefined;
  return (
    <form action={action} noValidate className="space-y-4">
      <input type="hidden" name="token" value={token} />
      <TextField label="Your name" name="name" autoComplete="name" required defaultValue={(state && !state.ok && state.values?.name) || name} errors={errors?.name} />
      <TextField label="Choose a password" name="password" type="password" autoComplete="new-password" hint="At least 10 characters." required errors={errors?.password} />
      <TextField label="Password again" name="confirm" type="password" autoComplete="new-password" required errors={errors?.confirm} />
      <FormMessage state={state} />
      <SubmitButton>Set password and continue</SubmitButton>
    </form>
  );
}
