// Mail the e2e server sent, read straight from the fake SMTP server's capture directory (as the demo
// operator does with `npm run mailbox`); the web Test mailbox shows each person only their own.
import { readCapturedMail, type CapturedMail } from "@/server/mail/captured-mail";

/** Captured messages to `address` (oldest first), waiting until at least `count` have arrived. */
export async function waitForMailTo(address: string, options: { subject?: RegExp; count?: number; timeoutMs?: number } = {}): Promise<CapturedMail[]> {
  const { subject, count = 1, timeoutMs = 15_000 } = options;
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const mails = (
      await readCapturedMail(process.env.E2E_MAILBOX_DIR!, { want: 100_000, scan: 100_000, keep: (m) => m.to.includes(address) && (!subject || subject.test(m.subject)) })
    ).reverse();
    if (mails.length >= count) return mails;
    if (Date.now() > deadline) throw new Error(`${mails.length} of ${count} mails to ${address} arrived`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

/** The one-time link (invitation or password reset) in a message. */
export function oneTimeLink(mail: CapturedMail): string {
  const link = /https?:\/\/\S+\/(invite|reset-password)\/[A-Za-z0-9_-]+(?:\?lang=[a-z]{2})?/.exec(mail.text)?.[0];
  if (!link) throw new Error(`no link in "${mail.subject}"`);
  return link;
}
