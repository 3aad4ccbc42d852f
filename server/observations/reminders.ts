import "server-only";
import { insertDueReminders } from "@/server/review/reminders";
import { deliverSoon } from "@/server/mail/outbox";
import { env } from "@/lib/env";

/** Queues today's reminders (due tomorrow, overdue) and sends them; safe to run often, it sends once a day per site. */
export async function runDueReminders(today?: string): Promise<number> {
  const queued = await insertDueReminders({ today, appUrl: env.APP_URL });
  if (queued > 0) await deliverSoon();
  return queued;
}
