import type { Metadata } from "next";
import Link from "next/link";
import { AcceptInviteForm } from "@/components/auth/password-forms";
import { getInvitationLink } from "@/db/queries/users";
import { hashToken } from "@/server/auth/tokens";
import { tokenSchema } from "@/lib/validation/auth";
import { invitationLinkAnswer } from "@/lib/domain/invitations";

export const metadata: Metadata = { title: "Welcome to Seedplot" };

export default async function InvitePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const invite = tokenSchema.safeParse(token).success ? await getInvitationLink(hashToken(token)) : null;
  const answer = invitationLinkAnswer({ link: invite, hasPassword: !!invite?.hasPassword, active: !!invite?.active, now: new Date() });
  const askFor = invite?.inviterName ? `Ask ${invite.inviterName}, who invited you,` : "Ask the person who invited you";
  if (answer === "used") {
    return (
      <>
        <h1 className="mb-2 text-2xl font-bold">This invitation was already used</h1>
        <p className="mb-4 text-loam-700">The password for this account is set. Sign in with it; if you forgot it, you can reset it from the sign-in page.</p>
        <Link href="/sign-in">Go to sign-in</Link>
      </>
    );
  }
  if (answer !== "valid" || !invite) {
    const [heading, why] =
      answer === "expired"
        ? ["This invitation has expired", "Invitation links work for 7 days."]
        : answer === "withdrawn"
          ? ["This invitation link no longer works", "It was cancelled, or a newer invitation replaced it."]
          : ["This invitation link is not valid", "Check that the whole link from the e-mail was copied."];
    return (
      <>
        <h1 className="mb-2 text-2xl font-bold">{heading}</h1>
        <p className="text-loam-700">
          {why} {answer === "unknown" ? "If it still does not work, ask the person who invited you" : askFor} to send you a new invitation.
        </p>
      </>
    );
  }
  const purpose = invite.role === "cooperator" ? "to start recording your trial plots" : "to start working in Seedplot";
  return (
    <>
      <h1 className="mb-1 text-2xl font-bold">Welcome to Seedplot</h1>
      <p className="mb-6 text-loam-700">
        Set a password for {invite.email} {purpose}. You are signed in as soon as it is set.
      </p>
      <AcceptInviteForm token={token} name={invite.name} email={invite.email} />
    </>
  );
}
