import { availableParallelism } from "node:os";
import { Worker } from "node:worker_threads";
import { executeRunJob, wallTimeCapMessage } from "./execute-run-job";
import type { RunJob, RunJobOutcome } from "./run-job";
import { createRunScheduler, type RunExecutor, type RunPool } from "./run-scheduler";

export type { RunPool } from "./run-scheduler";

/**
 * Where scenario replays run, so a long suite never blocks the server. The
 * fair order between members is the scheduler's (run-scheduler.ts); this file
 * only provides the executors.
 *
 * Why worker threads created as `new Worker(new URL("./run-worker.ts", import.meta.url))`:
 * since Next 16.2 Turbopack recognises exactly this form for `node:worker_threads`
 * and bundles the worker entry, with the TypeScript engine it imports, as its own
 * server chunk; `next build` + `next start` then load that chunk like any other
 * (tried with Next 16.4.6 before choosing). The alternatives cost more: a plain
 * .mjs entry importing a separately prebuilt engine bundle needs a second build
 * step that the e2e setup and `npm run demo` would both have to remember, and
 * running in-process (even yielding between scenarios) keeps every replay on the
 * event loop that answers other requests.
 *
 * Outside a Next server (vitest, tsx scripts) the URL points at the raw .ts file,
 * which Node 20 cannot load in a worker, so jobs run inline there, yielding to the
 * event loop before each scenario. The same executeRunJob runs either way. A worker
 * that cannot start (or crashes) also falls back to inline for the rest of the
 * process, so runs finish rather than hang.
 *
 * The runner stops a scenario at the wall-time cap by itself; a worker that
 * still has not answered well after the cap (a runner stuck without reaching a
 * budget check) is terminated and the job ends capped, so no slot is held forever.
 * Each worker holds up to RUN_JOBS_PER_WORKER jobs (default 2), so it never waits on a busy
 * event loop for its next one.
 *
 * RUN_EXECUTOR=inline|workers forces a mode; RUN_WORKERS sets the thread count
 * (default: cores - 1, at least 1, at most 4).
 */

function workerCount(): number {
  const configured = Number(process.env.RUN_WORKERS);
  if (Number.isInteger(configured) && configured > 0) return Math.min(configured, 16);
  return Math.max(1, Math.min(4, availableParallelism() - 1));
}

function defaultMode(): "workers" | "inline" {
  const forced = process.env.RUN_EXECUTOR;
  if (forced === "inline" || forced === "workers") return forced;
  // NEXT_RUNTIME is set inside a Next server, where the worker entry is bundled.
  return process.env.NEXT_RUNTIME === "nodejs" ? "workers" : "inline";
}

const yieldToEventLoop = () => new Promise<void>((resolve) => setImmediate(resolve));

/** Grace past the wall-time cap before a silent worker is terminated. */
const TERMINATE_GRACE_MS = 5_000;

function runInline(job: RunJob): Promise<RunJobOutcome> {
  // Let waiting requests (and SSE writes) through before each replay.
  return yieldToEventLoop().then(() => executeRunJob(job));
}

/** One job at a time on the server's own thread (tests, scripts, or when workers fail). */
function inlineExecutor(): RunExecutor {
  return { slots: 1, mode: "inline", execute: runInline, close: async () => {} };
}

/**
 * Jobs handed to one worker at a time. A worker answers through the server's
 * event loop; while that loop is busy answering requests, a finished worker
 * used to sit idle until the loop got round to its message and sent the next
 * job (about one job per loop turn under load). With a second job already in
 * its message queue it starts that one at once, and the loop only has to catch
 * up on the bookkeeping. Two is enough to hide one turn and keeps the fair
 * scheduler's choices close to the moment a job really starts.
 * RUN_JOBS_PER_WORKER sets it (1 to 4).
 */
function jobsPerWorker(): number {
  const configured = Number(process.env.RUN_JOBS_PER_WORKER);
  return Number.isInteger(configured) && configured >= 1 ? Math.min(configured, 4) : 2;
}

interface Handed {
  readonly job: RunJob;
  readonly resolve: (outcome: RunJobOutcome | Promise<RunJobOutcome>) => void;
}

interface PoolWorker {
  readonly thread: Worker;
  /** Jobs posted and not yet answered, in the order the worker runs them. */
  readonly handed: Handed[];
  watchdog?: ReturnType<typeof setTimeout>;
}

class WorkerExecutor implements RunExecutor {
  private readonly workers: PoolWorker[] = [];
  private readonly depth = jobsPerWorker();
  mode: "workers" | "inline" = "workers";

  constructor(private readonly size: number) {}

  get slots(): number {
    return this.mode === "workers" ? this.size * this.depth : 1;
  }

  execute(job: RunJob): Promise<RunJobOutcome> {
    if (this.mode === "inline") return runInline(job);
    const target = this.pickWorker();
    if (!target) return runInline(job);
    return new Promise<RunJobOutcome>((resolve) => {
      target.handed.push({ job, resolve });
      if (target.handed.length === 1) this.arm(target);
      target.thread.postMessage(job);
    });
  }

  /** An idle worker, else a new one while under the size, else the least loaded with room. */
  private pickWorker(): PoolWorker | undefined {
    const idle = this.workers.find((w) => w.handed.length === 0);
    if (idle) return idle;
    if (this.workers.length < this.size) {
      const started = this.startWorker();
      if (started) return started;
    }
    let best: PoolWorker | undefined;
    for (const w of this.workers) {
      if (w.handed.length < this.depth && (!best || w.handed.length < best.handed.length)) {
        best = w;
      }
    }
    return best;
  }

  /**
   * The watchdog follows the job at the head of a worker's queue: the runner
   * stops a scenario at the wall-time cap by itself; a worker that still has
   * not answered well after it is terminated and that job ends capped.
   */
  private arm(w: PoolWorker): void {
    clearTimeout(w.watchdog);
    const head = w.handed[0];
    if (!head) return;
    w.watchdog = setTimeout(() => {
      this.retire(w);
      void w.thread.terminate();
      const [stuck, ...rest] = w.handed.splice(0);
      const message = wallTimeCapMessage(stuck!.job.caps);
      stuck!.resolve({ runId: stuck!.job.runId, kind: "capped", cap: "wall-time", message });
      // Jobs queued behind it never started: they go to another worker.
      for (const waiting of rest) waiting.resolve(this.execute(waiting.job));
    }, head.job.caps.wallTimeMs + TERMINATE_GRACE_MS);
    w.watchdog.unref();
  }

  private startWorker(): PoolWorker | undefined {
    let thread: Worker;
    try {
      thread = new Worker(new URL("./run-worker.ts", import.meta.url));
    } catch (error) {
      this.fallBackToInline(error);
      return undefined;
    }
    const w: PoolWorker = { thread, handed: [] };
    thread.on("message", (outcome: RunJobOutcome) => {
      // The worker answers in order; matched by run id all the same.
      const at = w.handed.findIndex((h) => h.job.runId === outcome.runId);
      const [answered] = w.handed.splice(at < 0 ? 0 : at, 1);
      this.arm(w);
      answered?.resolve(outcome);
    });
    thread.on("error", (error: unknown) => {
      this.fallBackToInline(error);
      this.retire(w);
      // A crashed worker's jobs are retried inline; none silently disappears.
      for (const lost of w.handed.splice(0)) lost.resolve(runInline(lost.job));
    });
    thread.on("exit", () => {
      // Ended without an error event (or terminated above, with nothing left to answer).
      this.retire(w);
      for (const lost of w.handed.splice(0)) lost.resolve(runInline(lost.job));
    });
    // Idle workers must not keep a script (tsx, tests) alive.
    thread.unref();
    this.workers.push(w);
    return w;
  }

  private retire(w: PoolWorker): void {
    clearTimeout(w.watchdog);
    const at = this.workers.indexOf(w);
    if (at >= 0) this.workers.splice(at, 1);
  }

  private fallBackToInline(error: unknown): void {
    if (this.mode === "inline") return;
    console.error("run pool: worker threads unavailable, running scenarios inline", error);
    this.mode = "inline";
  }

  async close(): Promise<void> {
    const workers = this.workers.splice(0);
    for (const w of workers) {
      clearTimeout(w.watchdog);
      // Closing abandons what is still queued (the process is stopping).
      w.handed.length = 0;
    }
    await Promise.all(workers.map((w) => w.thread.terminate()));
  }
}

export function createRunPool(
  options: { mode?: "workers" | "inline"; size?: number } = {},
): RunPool {
  const mode = options.mode ?? defaultMode();
  return createRunScheduler(
    mode === "workers" ? new WorkerExecutor(options.size ?? workerCount()) : inlineExecutor(),
  );
}

// One pool per server process; kept on globalThis so a dev-server reload does
// not start another set of threads.
const globalForPool = globalThis as typeof globalThis & { __benchlineRunPool?: RunPool };

export function getRunPool(): RunPool {
  globalForPool.__benchlineRunPool ??= createRunPool();
  return globalForPool.__benchlineRunPool;
}
