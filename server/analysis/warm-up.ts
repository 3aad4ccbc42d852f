import "server-only";
import { env, isBuildPhase, listeningPort } from "@/lib/env";
import { warmUpAnalysis } from "@/lib/domain/analysis/warm-up";

// Why two steps. V8 compiles a function for the copy of the code that runs it, and Next bundles the analysis
// into each layer that imports it: the route handlers' copy is not instrumentation.ts's (a warm-up run there
// was measured to leave the first analysis as slow as before). Nor does `next start` load the route handlers'
// code before their first request. So when the server starts, instrumentation.ts asks the analysis route once
// over loopback without a session (answered 401, nothing read), which makes Next load that route's code, and
// the route's module then analyses a made-up trial in its own copy (warmUpAnalysisInThisCopy).

const shouldWarmUp = () => env.NODE_ENV === "production" && !isBuildPhase() && env.ANALYSIS_WARM_UP_ROUNDS > 0;

/** Called by instrumentation.ts at start: once the server listens, loads the analysis route's code by asking it once. */
export function loadAnalysisRouteAfterStart(): void {
  if (!shouldWarmUp()) return;
  const attempt = (left: number) => {
    const port = listeningPort();
    if (port === null) {
      if (left > 0) setTimeout(() => attempt(left - 1), 250).unref();
      return;
    }
    fetch(`http://127.0.0.1:${port}/api/trials/0/analysis`, { signal: AbortSignal.timeout(30_000) })
      .then((res) => res.body?.cancel())
      .catch(() => {
        // a server that cannot reach itself simply starts cold, as it did before
      });
  };
  setTimeout(() => attempt(40), 0).unref();
}

let warmed = false;

/**
 * Called by the analysis route's module when Next loads it: analyses a made-up trial in memory (no database)
 * ANALYSIS_WARM_UP_ROUNDS times, one round per turn of the event loop so a request arriving meanwhile waits
 * for one round at most, and logs what it cost. Production only.
 */
export function warmUpAnalysisInThisCopy(): void {
  if (warmed || !shouldWarmUp()) return;
  warmed = true;
  let spent = 0;
  const round = (left: number) => {
    spent += warmUpAnalysis(1);
    if (left > 1) setTimeout(() => round(left - 1), 0).unref();
    else console.log(`[warm-up] analysis code compiled on a made-up trial in ${spent.toFixed(0)} ms`);
  };
  setTimeout(() => round(env.ANALYSIS_WARM_UP_ROUNDS), 0).unref();
}
