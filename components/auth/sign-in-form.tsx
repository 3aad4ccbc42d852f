"use client";
import { useState } from "react";
import { signIn } from "next-auth/react";
import Link from "next/link";
import { TextField } from "@/components/ui/field";
import { Button } from "@/components/ui/button";
import { signInSchema } from "@/lib/validation/auth";
import { fieldErrorsOf } from "@/lib/validation/field-errors";

export function SignInForm({ callbackUrl, notice }: { callbackUrl: string; notice?: string }) {
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [fieldErrors, setFieldErrors] = useState<Record<string, string[]>>({});

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const parsed = signInSchema.safeParse({ email: form.get("email"), password: form.get("password") });
    if (!parsed.success) {
      setFieldErrors(fieldErrorsOf(parsed.error));
      setError("Please correct the marked fields.");
      return;
    }
    setFieldErrors({});
    setError(null);
    setPending(true);
    try {
      const result = await signIn("credentials", { ...parsed.data, redirect: false });
      if (!result || result.error) {
        setError(result?.error && result.error !== "CredentialsSignin" ? result.error : "That e-mail and password do not match an account.");
        return;
      }
      window.location.assign(callbackUrl);
    } catch {
      setError("We could not reach Seedplot. Check your connection and try again.");
    } finally {
      setPending(false);
    }
  }

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {notice && <p className="rounded-lg bg-sprout-50 px-3 py-2 text-sm font-medium text-sprout-700">{notice}</p>}
      <TextField label="E-mail" name="email" type="email" autoComplete="email" required errors={fieldErrors.email} />
      <TextField label="Password" name="password" type="password" autoComplete="current-password" required errors={fieldErrors.password} />
      <div aria-live="polite" role="status">
        {error && <p className="rounded-lg border border-beet-600 bg-beet-50 px-3 py-2 text-sm font-medium text-beet-700">{error}</p>}
      </div>
      <Button type="submit" disabled={pending} className="w-full">
        {pending ? "Signing in…" : "Sign in"}
      </Button>
      <p className="text-center text-sm">
        <Link href="/forgot-password">Forgot your password?</Link>
      </p>
    </form>
  );
}
