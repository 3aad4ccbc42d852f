// Background work inside the server process: retry queued mail every 30 seconds, so messages queued
// while the mail server was down go out once it is back.
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs" || process.env.SEEDPLOT_DISABLE_JOBS === "1") return;
  const { startBackgroundJobs } = await import("./lib/jobs");
  startBackgroundJobs();
}
