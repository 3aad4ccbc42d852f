import type { Metadata } from "next";
import Link from "next/link";
import { getLocale, getTranslations } from "next-intl/server";
import { AcceptInviteForm } from "@/components/auth/password-forms";
import { getInvitationLink } from "@/db/queries/users";
import { hashToken } from "@/server/auth/tokens";
import { tokenSchema } from "@/lib/validation/auth";
import { invitationLinkAnswer } from "@/lib/domain/invitations";
import { withLanguage } from "@/lib/domain/i18n/language-choice";

export async function generateMetadata(): Promise<Metadata> {
  return { title: (await getTranslations("auth"))("welcomeTitle") };
}

export default async function InvitePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const [t, locale] = await Promise.all([getTranslations("auth"), getLocale()]);
  const invite = tokenSchema.safeParse(token).success ? await getInvitationLink(hashToken(token)) : null;
  const answer = invitationLinkAnswer({ link: invite, hasPassword: !!invite?.hasPassword, active: !!invite?.active, now: new Date() });
  if (answer === "used") {
    return (
      <>
        <h1 className="mb-2 text-2xl font-bold">{t("inviteUsedTitle")}</h1>
        <p className="mb-4 text-loam-700">{t("inviteUsed")}</p>
        <Link href={withLanguage("/sign-in", locale)}>{t("goToSignIn")}</Link>
      </>
    );
  }
  if (answer !== "valid" || !invite) {
    const [heading, why] =
      answer === "expired"
        ? [t("inviteExpiredTitle"), t("inviteExpired")]
        : answer === "withdrawn"
          ? [t("inviteWithdrawnTitle"), t("inviteWithdrawn")]
          : [t("inviteUnknownTitle"), t("inviteUnknown")];
    return (
      <>
        <h1 className="mb-2 text-2xl font-bold">{heading}</h1>
        <p className="text-loam-700">
          {why} {answer === "unknown" ? t("askAgainUnknown") : invite?.inviterName ? t("askAgainInviter", { inviter: invite.inviterName }) : t("askAgainPerson")}
        </p>
      </>
    );
  }
  return (
    <>
      <h1 className="mb-1 text-2xl font-bold">{t("welcomeTitle")}</h1>
      <p className="mb-6 text-loam-700">{t("setPasswordFor", { email: invite.email, role: invite.role })}</p>
      <AcceptInviteForm token={token} name={invite.name} email={invite.email} />
    </>
  );
}
