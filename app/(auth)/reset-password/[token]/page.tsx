import type { Metadata } from "next";
import Link from "next/link";
import { ResetPasswordForm } from "@/components/auth/password-forms";
import { getValidToken } from "@/db/queries/users";
import { hashToken } from "@/server/auth/tokens";
import { tokenSchema } from "@/lib/validation/auth";

export const metadata: Metadata = { title: "Choose a new password" };

export default async function ResetPasswordPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const valid = tokenSchema.safeParse(token).success ? await getValidToken(hashToken(token), "password_reset") : null;
  if (!valid) {
    return (
      <>
        <h1 className="mb-2 text-2xl font-bold">This link no longer works</h1>
        <p className="text-loam-700">Reset links work once, for one hour. <Link href="/forgot-password">Ask for a new link</Link>.</p>
      </>
    );
  }
  return (
    <>
      <h1 className="mb-1 text-2xl font-bold">Choose a new password</h1>
      <p className="mb-6 text-loam-700">For {valid.email}</p>
      <ResetPasswordForm token={token} />
    </>
  );
}
