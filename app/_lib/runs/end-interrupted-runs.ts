import { type Db, getDb } from "@/db/client";
import { markInterruptedRuns } from "@/db/queries/runs";

const globalForStart = globalThis as typeof globalThis & { __benchlineRunsRecovered?: boolean };

/**
 * Start-up step of a server process: runs left queued or running by a process
 * that stopped (kill -9, a crash, a deploy) can never finish, because the run
 * pool lived in that process's memory, so they end now as errored and
 * "interrupted", and their event streams close on their first snapshot.
 *
 * Called from instrumentation.ts, which Next runs once per server process
 * before it answers any request. Not from getDb(): scripts (seed, migrate, the
 * tests) open the database too, and one of them running beside a live server
 * must never end that server's runs. Guarded so a second call in the same
 * process (a dev-server reload) does nothing.
 */
export function endInterruptedRuns(db: Db = getDb()): { runs: number; suiteRuns: number } {
  if (globalForStart.__benchlineRunsRecovered) return { runs: 0, suiteRuns: 0 };
  globalForStart.__benchlineRunsRecovered = true;
  const ended = markInterruptedRuns({ db });
  if (ended.runs + ended.suiteRuns > 0) {
    console.warn(
      `start-up: ended ${ended.runs} run(s) and ${ended.suiteRuns} suite run(s) interrupted by the last server stop`,
    );
  }
  return ended;
}
