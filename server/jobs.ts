import "server-only";
import { hostname } from "node:os";
import { randomUUID } from "node:crypto";
import { env } from "@/lib/env";
import { deliverPendingMail } from "@/server/mail/outbox";
import { runDueReminders } from "@/server/observations/reminders";
import { deleteOldSignInAttempts } from "@/db/mutations/sign-in-attempts";
import { extendLease, releaseLease, takeLease } from "@/db/mutations/job-leases";
import { deleteOldClientSaves } from "@/db/mutations/observations";

// Every instance runs the same timers. Mail needs no lease: each message is claimed row by row in the
// database (db/mutations/mail.ts, FOR UPDATE SKIP LOCKED), so any number of instances may deliver at once.
// Reminders and cleanup run once per period across all instances: the instance that takes the job's lease
// (db/mutations/job-leases.ts) runs it, the others skip until the period is over.
// Hourly is often enough for day-granular reminders; each site is reminded at most once a day.
const PERIOD_SECONDS = 3600;
// Each instance looks every few minutes, so the job runs soon after its period ends, whichever instance looks.
const LOOK_MS = 5 * 60_000;
// Held while a run is going; a holder that dies mid-run loses the job after this.
const RUN_LEASE_SECONDS = 10 * 60;

/** This process in lease rows and logs: INSTANCE_NAME, or host and process id. */
export const instanceName = (env.INSTANCE_NAME || `${hostname()}:${process.pid}`).slice(0, 80) + `:${randomUUID().slice(0, 8)}`;

export interface PeriodicJob {
  name: string;
  run: () => Promise<unknown>;
}

const PERIODIC_JOBS: PeriodicJob[] = [
  { name: "reminders", run: () => runDueReminders() },
  { name: "sign-in-log-cleanup", run: () => deleteOldSignInAttempts() },
  { name: "phone-save-log-cleanup", run: () => deleteOldClientSaves() },
];

const state = { started: false, stopping: false, timers: [] as NodeJS.Timeout[], running: new Map<string, { holder: string; done: Promise<void> }>() };

/** Runs the job when this instance takes its lease; true when it ran here. */
export async function runIfLeaseFree(job: PeriodicJob, periodSeconds = PERIOD_SECONDS, holder = instanceName): Promise<boolean> {
  if (state.stopping || state.running.has(job.name)) return false;
  if (!(await takeLease(job.name, holder, RUN_LEASE_SECONDS))) {
    console.log(`[jobs] ${job.name}: another instance has it this period`);
    return false;
  }
  const started = Date.now();
  const run = (async () => {
    try {
      await job.run();
      console.log(`[jobs] ${job.name}: ran on ${holder}`);
      await extendLease(job.name, holder, Math.max(1, periodSeconds - (Date.now() - started) / 1000));
    } catch (e) {
      console.error(`[jobs] ${job.name} failed:`, e instanceof Error ? e.message : e);
      // Let another instance (or the next look) try again rather than wait out the period.
      await releaseLease(job.name, holder).catch(() => undefined);
    }
  })();
  state.running.set(job.name, { holder, done: run });
  await run.finally(() => state.running.delete(job.name));
  return true;
}

/** Starts the in-process timers once per server process. */
export function startBackgroundJobs(firstLookMs = 60_000) {
  if (state.started) return;
  state.started = true;
  const retryMail = setInterval(() => {
    deliverPendingMail().catch((e) => console.error("[jobs] mail retry failed:", e instanceof Error ? e.message : e));
  }, env.MAIL_RETRY_SECONDS * 1000);
  const look = () => {
    for (const job of PERIODIC_JOBS) void runIfLeaseFree(job).catch((e) => console.error(`[jobs] ${job.name}: lease not reachable:`, e instanceof Error ? e.message : e));
  };
  const first = setTimeout(look, firstLookMs);
  const every = setInterval(look, LOOK_MS);
  for (const t of [retryMail, first, every]) {
    t.unref();
    state.timers.push(t);
  }
}

/**
 * Shutdown: no new runs, and the lease of a run still going is given up at once (the process may exit before
 * the run ends), so another instance takes the job over at its next look instead of after the lease expires.
 * A run that does finish first extends the lease again if nobody has taken it meanwhile.
 */
export async function stopBackgroundJobs() {
  state.stopping = true;
  for (const t of state.timers) clearTimeout(t);
  state.timers = [];
  await Promise.all([...state.running].map(([name, run]) => releaseLease(name, run.holder)));
}
