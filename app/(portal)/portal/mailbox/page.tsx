import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { requireRole } from "@/lib/auth/guards";
import { listCapturedMail } from "@/lib/mail/mailbox";
import { env } from "@/lib/env";
import { Card } from "@/components/ui/card";

export const metadata: Metadata = { title: "Test mailbox" };

// Linkify only links to this app, so a captured message cannot send staff elsewhere.
function linkify(text: string) {
  const parts = text.split(/(https?:\/\/\S+)/g);
  return parts.map((part, i) =>
    part.startsWith(env.APP_URL) ? (
      <a key={i} href={part}>
        {part}
      </a>
    ) : (
      part
    ),
  );
}

export default async function MailboxPage() {
  await requireRole("coordinator", "admin");
  if (env.MAIL_MODE !== "capture") notFound();
  const mails = await listCapturedMail();
  return (
    <div className="space-y-6">
      <h1 className="text-3xl font-bold">Test mailbox</h1>
      <p className="text-loam-700">
        Messages caught by the local mail server. Nothing here left this machine. Follow an invitation or reset link to try it.
      </p>
      {mails.length === 0 && <p>No messages yet.</p>}
      {mails.map((m) => (
        <Card key={m.id}>
          <article>
            <h2 className="text-lg font-bold">{m.subject}</h2>
            <p className="text-sm text-loam-700">
              To {m.to.join(", ")} · {new Date(m.receivedAt).toLocaleString("en-GB", { timeZone: "UTC" })} UTC
            </p>
            <pre className="mt-3 whitespace-pre-wrap break-words font-sans text-sm">{linkify(m.text)}</pre>
          </article>
        </Card>
      ))}
    </div>
  );
}
