// Runs once when the server starts. Records each request's client address from its connection (for the
// per-address sign-in and reset limits), starts the background work (mail retries every 30 seconds,
// reminders and cleanup under a lease shared by all instances: server/jobs.ts), prepares shutdown, and has the
// analysis code compiled before the first analysis is asked for (server/analysis/warm-up.ts).
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { installClientAddressTracking } = await import("./server/auth/request-address");
  installClientAddressTracking();
  const { installGracefulShutdown } = await import("./server/shutdown");
  installGracefulShutdown();
  // Loads the analysis route's code once the server listens, which compiles it on a made-up trial (server/analysis/warm-up.ts).
  const { loadAnalysisRouteAfterStart } = await import("./server/analysis/warm-up");
  loadAnalysisRouteAfterStart();
  if (process.env.SEEDPLOT_DISABLE_JOBS === "1") return;
  const { startBackgroundJobs } = await import("./server/jobs");
  const { env } = await import("./lib/env");
  startBackgroundJobs(env.JOBS_FIRST_LOOK_SECONDS * 1000);
}
