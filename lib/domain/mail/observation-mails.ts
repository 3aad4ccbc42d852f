import type { OutgoingMail } from "./templates";

// E-mails about a site's data: what happened, what to do next, and a link. Plain text, short.

const SIGNATURE = "\n\n-- \nSeedplot, on-farm variety trials of the Tamarack Valley Extension District";

export function submissionReceivedMail(p: { to: string; name: string; siteName: string; trialTitle: string; growerName: string; link: string }): OutgoingMail {
  return {
    to: p.to,
    subject: `Data received: ${p.siteName}, ${p.trialTitle}`,
    text: `Hello ${p.name},\n\n${p.growerName} has sent the data of ${p.siteName} for "${p.trialTitle}" for review.\n\nReview it, then accept it or return it with comments:\n${p.link}` + SIGNATURE,
  };
}

export function dataReturnedMail(p: { to: string; name: string; siteName: string; trialTitle: string; message: string | null; comments: string[]; link: string }): OutgoingMail {
  const list = p.comments.length ? `\n\nComments:\n${p.comments.map((c) => `- ${c}`).join("\n")}` : "";
  const note = p.message ? `\n\n${p.message}` : "";
  return {
    to: p.to,
    subject: `Please check your data: ${p.siteName}, ${p.trialTitle}`,
    text: `Hello ${p.name},\n\nYour coordinator has returned the data of ${p.siteName} for "${p.trialTitle}" with questions.${note}${list}\n\nCorrect or confirm the values, then send the data again:\n${p.link}` + SIGNATURE,
  };
}

export function dataAcceptedMail(p: { to: string; name: string; siteName: string; trialTitle: string; link: string }): OutgoingMail {
  return {
    to: p.to,
    subject: `Data accepted: ${p.siteName}, ${p.trialTitle}`,
    text: `Hello ${p.name},\n\nYour coordinator has accepted the data of ${p.siteName} for "${p.trialTitle}". Thank you for your careful work.\n\n${p.link}` + SIGNATURE,
  };
}

/** One reminder per grower and site: counts due tomorrow and counts already overdue. */
export function reminderMail(p: { to: string; name: string; siteName: string; trialTitle: string; tomorrow: string[]; overdue: string[]; link: string }): OutgoingMail {
  const parts: string[] = [];
  if (p.overdue.length) parts.push(`Overdue:\n${p.overdue.map((x) => `- ${x}`).join("\n")}`);
  if (p.tomorrow.length) parts.push(`Due tomorrow:\n${p.tomorrow.map((x) => `- ${x}`).join("\n")}`);
  return {
    to: p.to,
    subject: p.overdue.length ? `Overdue counts at ${p.siteName}` : `Counts due tomorrow at ${p.siteName}`,
    text: `Hello ${p.name},\n\nA reminder for "${p.trialTitle}" at ${p.siteName}.\n\n${parts.join("\n\n")}\n\nRecord them here (on your phone too):\n${p.link}` + SIGNATURE,
  };
}
