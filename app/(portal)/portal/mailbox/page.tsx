import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { requireUser } from "@/server/auth/guards";
import { listCapturedMailFor, mailIsCaptured } from "@/server/mail/mailbox";
import { linkSegments } from "@/lib/domain/mail/linkify";
import { env } from "@/lib/env";
import { Card } from "@/components/ui/card";
import { formatDateTime } from "@/lib/domain/vocabulary/labels";

export const metadata: Metadata = { title: "Test mailbox" };

export default async function MailboxPage() {
  // With a real mail server there is no test mailbox at all, for anyone.
  if (!mailIsCaptured()) notFound();
  const viewer = await requireUser();
  const mails = await listCapturedMailFor(viewer);
  return (
    <div className="space-y-6">
      <h1 className="text-3xl font-bold">Test mailbox</h1>
      <p className="text-loam-700">
        Messages to you ({viewer.email}) caught by the local mail server. Nothing here left this machine, and mail to
        other people is not shown here.
        {viewer.role !== "cooperator" && (
          <>
            {" "}
            Whoever runs this server reads all of it, invitations you send included, with <code>npm run mailbox</code> in a
            terminal.
          </>
        )}
      </p>
      {mails.length === 0 && <p>No messages to you yet.</p>}
      {mails.map((m) => (
        <Card key={m.id}>
          <article>
            <h2 className="text-lg font-bold">{m.subject}</h2>
            <p className="text-sm text-loam-700">
              To {m.to.join(", ")} · {formatDateTime(m.receivedAt)}
            </p>
            <pre className="mt-3 whitespace-pre-wrap break-words font-sans text-sm">
              {linkSegments(m.text, env.APP_URL).map((s, i) =>
                s.href ? (
                  <a key={i} href={s.href}>
                    {s.text}
                  </a>
                ) : (
                  s.text
                ),
              )}
            </pre>
          </article>
        </Card>
      ))}
    </div>
  );
}
