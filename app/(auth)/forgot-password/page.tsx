import type { Metadata } from "next";
import Link from "next/link";
import { ForgotPasswordForm } from "@/components/auth/password-forms";

export const metadata: Metadata = { title: "Reset your password" };

export default function ForgotPasswordPage() {
  return (
    <>
      <h1 className="mb-1 text-2xl font-bold">Reset your password</h1>
      <p className="mb-6 text-loam-700">Enter the e-mail you sign in with. We will send you a link to choose a new password.</p>
      <ForgotPasswordForm />
      <p className="mt-6 text-sm"><Link href="/sign-in">Back to sign in</Link></p>
    </>
  );
}
