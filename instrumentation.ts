// Runs once when the server starts. Records each request's client address from its connection (for the
// per-address sign-in and reset limits), and starts the background work: retry queued mail every 30
// seconds, so messages queued while the mail server was down go out once it is back.
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { installClientAddressTracking } = await import("./server/auth/request-address");
  installClientAddressTracking();
  if (process.env.SEEDPLOT_DISABLE_JOBS === "1") return;
  const { startBackgroundJobs } = await import("./server/jobs");
  startBackgroundJobs();
}
