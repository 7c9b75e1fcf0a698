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

class WorkerExecutor implements RunExecutor {
  private readonly idle: Worker[] = [];
  private readonly busy = new Set<Worker>();
  private workersStarted = 0;
  mode: "workers" | "inline" = "workers";

  constructor(private readonly size: number) {}

  get slots(): number {
    return this.mode === "workers" ? this.size : 1;
  }

  execute(job: RunJob): Promise<RunJobOutcome> {
    if (this.mode === "inline") return runInline(job);
    const worker = this.idle.pop() ?? this.startWorker();
    if (!worker) return runInline(job);
    this.busy.add(worker);
    return new Promise<RunJobOutcome>((resolve) => {
      const settle = (outcome: RunJobOutcome | undefined, healthy: boolean) => {
        clearTimeout(watchdog);
        worker.off("message", onMessage);
        worker.off("error", onError);
        this.busy.delete(worker);
        if (healthy) this.idle.push(worker);
        else this.workersStarted -= 1;
        // A crashed worker's job is retried inline; it never silently disappears.
        resolve(outcome ?? runInline(job));
      };
      const onMessage = (outcome: RunJobOutcome) => settle(outcome, true);
      const onError = (error: unknown) => {
        this.fallBackToInline(error);
        settle(undefined, false);
      };
      const watchdog = setTimeout(() => {
        void worker.terminate();
        const message = wallTimeCapMessage(job.caps);
        settle({ runId: job.runId, kind: "capped", cap: "wall-time", message }, false);
      }, job.caps.wallTimeMs + TERMINATE_GRACE_MS);
      watchdog.unref();
      worker.on("message", onMessage);
      worker.on("error", onError);
      worker.postMessage(job);
    });
  }

  private startWorker(): Worker | undefined {
    if (this.workersStarted >= this.size) return undefined;
    let worker: Worker;
    try {
      worker = new Worker(new URL("./run-worker.ts", import.meta.url));
    } catch (error) {
      this.fallBackToInline(error);
      return undefined;
    }
    this.workersStarted += 1;
    // Idle workers must not keep a script (tsx, tests) alive.
    worker.unref();
    return worker;
  }

  private fallBackToInline(error: unknown): void {
    if (this.mode === "inline") return;
    console.error("run pool: worker threads unavailable, running scenarios inline", error);
    this.mode = "inline";
  }

  async close(): Promise<void> {
    const workers = [...this.idle, ...this.busy];
    this.idle.length = 0;
    this.busy.clear();
    await Promise.all(workers.map((worker) => worker.terminate()));
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
