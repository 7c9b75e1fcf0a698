/**
 * Next calls register() once per server process, and waits for it before the
 * server answers any request: the place for start-up work. Only in the Node.js
 * runtime (the edge runtime has no database), and never while `next build`
 * prerenders, which must not touch a live database.
 */
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  if (process.env.NEXT_PHASE === "phase-production-build") return;
  const { endInterruptedRuns } = await import("./app/_lib/runs/end-interrupted-runs");
  endInterruptedRuns();
  const { endLiveSessionsOnExit } = await import("./app/_lib/live/end-live-sessions-on-exit");
  endLiveSessionsOnExit();
}
