// Runs once when the server starts. Records each request's client address from its connection (for the
// per-address sign-in and reset limits), starts the background work (mail retries every 30 seconds,
// reminders and cleanup under a lease shared by all instances: server/jobs.ts), and prepares shutdown.
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { installClientAddressTracking } = await import("./server/auth/request-address");
  installClientAddressTracking();
  const { installGracefulShutdown } = await import("./server/shutdown");
  installGracefulShutdown();
  if (process.env.SEEDPLOT_DISABLE_JOBS === "1") return;
  const { startBackgroundJobs } = await import("./server/jobs");
  const { env } = await import("./lib/env");
  startBackgroundJobs(env.JOBS_FIRST_LOOK_SECONDS * 1000);
}
