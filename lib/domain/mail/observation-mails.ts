import type { OutgoingMail } from "./templates";
import { translatorFor } from "@/lib/domain/i18n/catalogue";
import type { Locale } from "@/lib/domain/vocabulary/enums";

// E-mails about a site's data: what happened, what to do next, and a link. Plain text, short.

const SIGNATURE = "\n\n-- \nSeedplot, on-farm variety trials of the Tamarack Valley Extension District";

export function submissionReceivedMail(p: { to: string; name: string; siteName: string; trialTitle: string; growerName: string; link: string }): OutgoingMail {
  return {
    to: p.to,
    subject: `Data received: ${p.siteName}, ${p.trialTitle}`,
    text: `Hello ${p.name},\n\n${p.growerName} has sent the data of ${p.siteName} for "${p.trialTitle}" for review.\n\nReview it, then accept it or return it with comments:\n${p.link}` + SIGNATURE,
  };
}

// Mails to growers are in the recipient's own language (their profile); `locale` absent means English.

export function dataReturnedMail(p: { to: string; name: string; siteName: string; trialTitle: string; message: string | null; comments: string[]; link: string; locale?: Locale }): OutgoingMail {
  const t = translatorFor(p.locale);
  const where = { site: p.siteName, trial: p.trialTitle };
  const list = p.comments.length ? `\n\n${t("mail.returnedList")}\n${p.comments.map((c) => `- ${c}`).join("\n")}` : "";
  const note = p.message ? `\n\n${p.message}` : "";
  return {
    to: p.to,
    subject: t("mail.returnedSubject", where),
    text: `${t("mail.hello", { name: p.name })}\n\n${t("mail.returnedBody", where)}${note}${list}\n\n${t("mail.returnedAction")}\n${p.link}` + t("mail.signature"),
  };
}

export function dataAcceptedMail(p: { to: string; name: string; siteName: string; trialTitle: string; link: string; locale?: Locale }): OutgoingMail {
  const t = translatorFor(p.locale);
  const where = { site: p.siteName, trial: p.trialTitle };
  return {
    to: p.to,
    subject: t("mail.acceptedSubject", where),
    text: `${t("mail.hello", { name: p.name })}\n\n${t("mail.acceptedBody", where)}\n\n${p.link}` + t("mail.signature"),
  };
}

/** One reminder per grower and site: counts due tomorrow and counts already overdue. */
export function reminderMail(p: { to: string; name: string; siteName: string; trialTitle: string; tomorrow: string[]; overdue: string[]; link: string; locale?: Locale }): OutgoingMail {
  const t = translatorFor(p.locale);
  const parts: string[] = [];
  if (p.overdue.length) parts.push(`${t("mail.reminderOverdue")}\n${p.overdue.map((x) => `- ${x}`).join("\n")}`);
  if (p.tomorrow.length) parts.push(`${t("mail.reminderTomorrow")}\n${p.tomorrow.map((x) => `- ${x}`).join("\n")}`);
  return {
    to: p.to,
    subject: p.overdue.length ? t("mail.reminderSubjectOverdue", { site: p.siteName }) : t("mail.reminderSubjectTomorrow", { site: p.siteName }),
    text: `${t("mail.hello", { name: p.name })}\n\n${t("mail.reminderBody", { site: p.siteName, trial: p.trialTitle })}\n\n${parts.join("\n\n")}\n\n${t("mail.reminderAction")}\n${p.link}` + t("mail.signature"),
  };
}
