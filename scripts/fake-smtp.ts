// A local fake SMTP server: accepts every message on loopback and stores it as JSON in MAILBOX_DIR, where
// `npm run mailbox`, the Test mailbox page (each person their own messages) and the tests read it.
// Nothing is relayed anywhere.
import { SMTPServer } from "smtp-server";
import { simpleParser } from "mailparser";
import { promises as fs } from "node:fs";
import path from "node:path";
import { randomUUID } from "node:crypto";

const port = Number(process.env.SMTP_PORT ?? 2525);
const dir = path.resolve(process.env.MAILBOX_DIR ?? ".data/mailbox");

export function startFakeSmtp(options: { port: number; dir: string }) {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS", "AUTH"],
    logger: false,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then(async (parsed) => {
          await fs.mkdir(options.dir, { recursive: true });
          const receivedAt = new Date().toISOString();
          const id = `${receivedAt.replace(/[:.]/g, "-")}-${randomUUID().slice(0, 8)}`;
          const record = {
            id,
            receivedAt,
            from: session.envelope.mailFrom ? session.envelope.mailFrom.address : "",
            to: session.envelope.rcptTo.map((r) => r.address),
            subject: parsed.subject ?? "",
            text: parsed.text ?? "",
          };
          await fs.writeFile(path.join(options.dir, `${id}.json`), JSON.stringify(record, null, 2));
          callback();
        })
        .catch((e: Error) => callback(e));
    },
  });
  return new Promise<SMTPServer>((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port, "127.0.0.1", () => resolve(server));
  });
}

if (process.argv[1]?.endsWith("fake-smtp.ts")) {
  startFakeSmtp({ port, dir })
    .then(() => console.log(`[seedplot] fake SMTP server on 127.0.0.1:${port}, saving to ${dir}`))
    .catch((e) => {
      console.error(`[seedplot] fake SMTP server could not start: ${e.message}`);
      process.exit(1);
    });
}
