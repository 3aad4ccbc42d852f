// The demo operator's view of every captured message (the web Test mailbox shows each person only their
// own): prints the newest messages from the capture directory, with their invitation and reset links.
//   npm run mailbox                 the 10 newest messages
//   npm run mailbox -- 3            the 3 newest
//   npm run mailbox -- --to ADDRESS only messages to ADDRESS
import path from "node:path";
import { env } from "@/lib/env";
import { readCapturedMail } from "@/server/mail/captured-mail";

const args = process.argv.slice(2);
const toIndex = args.indexOf("--to");
const to = toIndex >= 0 ? args[toIndex + 1]?.toLowerCase() : undefined;
const countArg = args.find((a, i) => /^\d+$/.test(a) && (toIndex < 0 || i !== toIndex + 1));
const count = countArg ? Number(countArg) : 10;
const dir = path.resolve(env.MAILBOX_DIR);

const mails = await readCapturedMail(dir, { want: count, scan: to ? 100_000 : count, keep: (m) => !to || m.to.some((t) => t.toLowerCase() === to) });
if (mails.length === 0) {
  console.log(`No captured messages${to ? ` to ${to}` : ""} in ${dir}.`);
} else {
  // Oldest first, so the newest message ends up next to the prompt.
  for (const m of mails.reverse()) {
    console.log(`${"=".repeat(72)}\n${m.receivedAt}  To: ${m.to.join(", ")}\nSubject: ${m.subject}\n\n${m.text.trim()}\n`);
  }
  console.log(`${mails.length} message(s) from ${dir}, newest last.`);
}
