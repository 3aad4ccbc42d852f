import "server-only";
import { stopBackgroundJobs } from "@/server/jobs";

// On SIGTERM, `next start` itself stops accepting connections, lets the requests in progress finish and then
// exits. Alongside it, this marks the instance as draining (GET /api/health answers 503, so a load balancer
// that still holds a connection moves on), stops the job timers and gives up the lease of any job run that
// cannot finish in time, so another instance takes the job over at once instead of after the lease expires.
// On globalThis: instrumentation and the route handlers are bundled separately, each with its own module copies.
const holder = globalThis as Record<symbol, { draining: boolean; installed: boolean } | undefined>;
const KEY = Symbol.for("seedplot.shutdown");
const state = (holder[KEY] ??= { draining: false, installed: false });

/** True once this instance has been told to stop. */
export const isDraining = () => state.draining;

export function installGracefulShutdown() {
  if (state.installed) return;
  state.installed = true;
  const onSignal = (signal: string) => {
    if (state.draining) return;
    state.draining = true;
    console.log(`[shutdown] ${signal}: finishing requests in progress, releasing job leases`);
    stopBackgroundJobs().catch((e) => console.error("[shutdown] leases not released:", e instanceof Error ? e.message : e));
  };
  process.once("SIGTERM", () => onSignal("SIGTERM"));
  process.once("SIGINT", () => onSignal("SIGINT"));
}
