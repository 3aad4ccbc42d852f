import { deliverPendingMail } from "@/lib/mail/outbox";

const MAIL_RETRY_MS = 30_000;
let started = false;

/** Starts the in-process timers once per server process. */
export function startBackgroundJobs() {
  if (started) return;
  started = true;
  const timer = setInterval(() => {
    deliverPendingMail().catch((e) => console.error("[jobs] mail retry failed:", e instanceof Error ? e.message : e));
  }, MAIL_RETRY_MS);
  timer.unref();
}
