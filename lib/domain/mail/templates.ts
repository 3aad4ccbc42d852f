import { translatorFor } from "@/lib/domain/i18n/catalogue";
import type { Locale } from "@/lib/domain/vocabulary/enums";

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
}

const SIGNATURE = "\n\n-- \nSeedplot, on-farm variety trials of the Tamarack Valley Extension District";

/** Invitation for a coordinator or administrator, with the one-time link to set a password. */
export function staffInviteMail(p: { to: string; name: string; inviterName: string; roleLabel: string; programNames: string[]; link: string }): OutgoingMail {
  const programs = p.programNames.length > 0 ? ` for ${p.programNames.join(", ")}` : "";
  return {
    to: p.to,
    subject: `You're invited to Seedplot as ${p.roleLabel.toLowerCase()}`,
    text:
      `Hello ${p.name},\n\n${p.inviterName} has invited you to Seedplot as ${p.roleLabel.toLowerCase()}${programs}. Seedplot is where ` +
      `the extension program sets up its variety trials, and partner growers record their plots.\n\n` +
      `Set your password and sign in here (the link works once, for 7 days):\n${p.link}\n\n` +
      `If you were not expecting this, you can ignore this message.` +
      SIGNATURE,
  };
}

/** Invitation for a partner grower, with the one-time link to set a password, in the grower's language. */
export function inviteMail(p: { to: string; name: string; inviterName: string; link: string; siteName?: string | null; locale?: Locale }): OutgoingMail {
  const t = translatorFor(p.locale);
  return {
    to: p.to,
    subject: t("accessMail.inviteSubject"),
    text:
      `${t("mail.hello", { name: p.name })}\n\n${t("accessMail.inviteBody", { inviter: p.inviterName, site: p.siteName || "none" })}\n\n` +
      `${t("accessMail.inviteAction")}\n${p.link}\n\n${t("accessMail.notExpecting")}` +
      t("mail.signature"),
  };
}

/** Tells a grower who already has an account that a coordinator added them to a site. */
export function siteAccessMail(p: { to: string; name: string; inviterName: string; siteName: string; link: string; locale?: Locale }): OutgoingMail {
  const t = translatorFor(p.locale);
  return {
    to: p.to,
    subject: t("accessMail.siteAccessSubject", { site: p.siteName }),
    text:
      `${t("mail.hello", { name: p.name })}\n\n${t("accessMail.siteAccessBody", { inviter: p.inviterName, site: p.siteName })}\n${p.link}\n\n` +
      t("accessMail.siteAccessNotExpecting", { inviter: p.inviterName }) +
      t("mail.signature"),
  };
}

/** Password-reset link; valid for one hour. */
export function passwordResetMail(p: { to: string; name: string; link: string; locale?: Locale }): OutgoingMail {
  const t = translatorFor(p.locale);
  return {
    to: p.to,
    subject: t("accessMail.resetSubject"),
    text:
      `${t("mail.hello", { name: p.name })}\n\n${t("accessMail.resetBody")}\n\n${t("accessMail.resetAction")}\n${p.link}\n\n` +
      t("accessMail.resetNotAsked") +
      t("mail.signature"),
  };
}

/** Tells a grower who already has an account that their site joined a trial. */
export function enrolmentNoticeMail(p: { to: string; name: string; siteName: string; trialTitle: string; link: string; locale?: Locale }): OutgoingMail {
  const t = translatorFor(p.locale);
  return {
    to: p.to,
    subject: t("mail.enrolmentSubject", { site: p.siteName, trial: p.trialTitle }),
    text: `${t("mail.hello", { name: p.name })}\n\n${t("mail.enrolmentBody", { site: p.siteName, trial: p.trialTitle })}\n${p.link}` + t("mail.signature"),
  };
}

/**
 * Notice to a grower whose sites are all left out of a published version: the results are public, without
 * their site, and why (in the public words). Growers of included sites get resultsPublishedMail instead.
 */
export function resultsPublishedWithoutSiteMail(p: { to: string; name: string; trialTitle: string; version: number; link: string; sites: { name: string; why: string }[] }): OutgoingMail {
  const what = p.version > 1 ? `A new version (version ${p.version}) of the results` : "The results";
  const yours = p.sites.map((s) => `${s.name} (${s.why})`).join("; ");
  return {
    to: p.to,
    subject: `Results published without your site: ${p.trialTitle}`,
    text:
      `Hello ${p.name},\n\n${what} of "${p.trialTitle}" are now public:\n${p.link}\n\n` +
      `They do not include your site: ${yours}. If a later version includes your site's data, we will let you know.` +
      SIGNATURE,
  };
}

/** Notice to the growers of the sites a published version includes that the results are out. */
export function resultsPublishedMail(p: { to: string; name: string; trialTitle: string; version: number; link: string }): OutgoingMail {
  const what = p.version > 1 ? `A corrected version (version ${p.version}) of the results` : "The results";
  return {
    to: p.to,
    subject: `Results published: ${p.trialTitle}`,
    text:
      `Hello ${p.name},\n\n${what} of "${p.trialTitle}", which your site helped grow, are now public, with the ` +
      `variety names revealed:\n${p.link}\n\nThank you for your plots and your careful counts.` +
      SIGNATURE,
  };
}
