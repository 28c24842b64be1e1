/**
 * Next's start-up hook: runs once when a server instance boots (`next start`, `next dev`),
 * before it answers requests. It checks the environment, so a production server with the
 * demo secrets and without TRIBUTARY_DEMO=1 stops at boot with a message saying what to set.
 */
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  // `next build` loads the hook too and needs no settings
  if (process.env.NEXT_PHASE === "phase-production-build") return;
  // an error thrown here is only logged by some Next versions: the check ends the process itself
  const { exitUnlessEnvOk } = await import("./lib/env");
  exitUnlessEnvOk("tributary");
}
