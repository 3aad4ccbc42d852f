import "server-only";
import { deliverPendingMail } from "@/server/mail/outbox";
import { runDueReminders } from "@/server/observations/reminders";
import { deleteOldSignInAttempts } from "@/db/mutations/sign-in-attempts";
import { deleteOldClientSaves } from "@/db/mutations/observations";

const MAIL_RETRY_MS = 30_000;
// Hourly is often enough for day-granular reminders; each site is reminded at most once a day.
const REMINDER_MS = 60 * 60_000;
const REMINDER_FIRST_MS = 60_000;
let started = false;

/** Starts the in-process timers once per server process. */
export function startBackgroundJobs() {
  if (started) return;
  started = true;
  const timer = setInterval(() => {
    deliverPendingMail().catch((e) => console.error("[jobs] mail retry failed:", e instanceof Error ? e.message : e));
  }, MAIL_RETRY_MS);
  timer.unref();
  const remind = () => {
    runDueReminders().catch((e) => console.error("[jobs] reminders failed:", e instanceof Error ? e.message : e));
    deleteOldSignInAttempts().catch((e) => console.error("[jobs] sign-in log cleanup failed:", e instanceof Error ? e.message : e));
    deleteOldClientSaves().catch((e) => console.error("[jobs] phone save log cleanup failed:", e instanceof Error ? e.message : e));
  };
  setTimeout(remind, REMINDER_FIRST_MS).unref();
  setInterval(remind, REMINDER_MS).unref();
}
