import type { Metadata } from "next";
import { AcceptInviteForm } from "@/components/auth/password-forms";
import { getValidToken } from "@/db/queries/users";
import { hashToken } from "@/server/auth/tokens";
import { tokenSchema } from "@/lib/validation/auth";

export const metadata: Metadata = { title: "Welcome to Seedplot" };

export default async function InvitePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const invite = tokenSchema.safeParse(token).success ? await getValidToken(hashToken(token), "invite") : null;
  if (!invite) {
    return (
      <>
        <h1 className="mb-2 text-2xl font-bold">This invitation has expired</h1>
        <p className="text-loam-700">
          Invitation links work once, for 7 days. Ask your trial coordinator to send you a new invitation.
        </p>
      </>
    );
  }
  return (
    <>
      <h1 className="mb-1 text-2xl font-bold">Welcome to Seedplot</h1>
      <p className="mb-6 text-loam-700">Set a password for {invite.email} to start recording your trial plots.</p>
      <AcceptInviteForm token={token} name={invite.name} />
    </>
  );
}
