import { availableParallelism } from "node:os";
import { Worker } from "node:worker_threads";
import { executeRunJob } from "./execute-run-job";
import type { RunJob, RunJobOutcome } from "./run-job";

/**
 * Where scenario replays run, so a long suite never blocks the server.
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
 * event loop between scenarios. The same executeRunJob runs either way. A worker
 * that cannot start (or crashes) also falls back to inline for the rest of the
 * process, so runs finish rather than hang.
 *
 * RUN_EXECUTOR=inline|workers forces a mode; RUN_WORKERS sets the thread count
 * (default: cores - 1, at least 1, at most 4).
 */
export interface RunPool {
  /** Queue a job; resolves when it has run. `onStart` fires when a worker picks it up. */
  run(job: RunJob, onStart?: () => void): Promise<RunJobOutcome>;
  /** Jobs waiting plus jobs running. */
  readonly pending: number;
  readonly mode: "workers" | "inline";
  close(): Promise<void>;
}

interface Queued {
  readonly job: RunJob;
  readonly onStart?: () => void;
  readonly resolve: (outcome: RunJobOutcome) => void;
}

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

class Pool implements RunPool {
  private readonly queue: Queued[] = [];
  private readonly idle: Worker[] = [];
  private readonly busy = new Map<Worker, Queued>();
  private workersStarted = 0;
  private inlineRunning = false;
  mode: "workers" | "inline";

  constructor(
    mode: "workers" | "inline",
    private readonly size: number,
  ) {
    this.mode = mode;
  }

  get pending(): number {
    return this.queue.length + this.busy.size + (this.inlineRunning ? 1 : 0);
  }

  run(job: RunJob, onStart?: () => void): Promise<RunJobOutcome> {
    return new Promise((resolve) => {
      this.queue.push({ job, onStart, resolve });
      this.pump();
    });
  }

  private pump(): void {
    if (this.mode === "inline") {
      void this.pumpInline();
      return;
    }
    while (this.queue.length > 0) {
      const worker = this.idle.pop() ?? this.startWorker();
      if (!worker) return;
      const next = this.queue.shift()!;
      this.busy.set(worker, next);
      next.onStart?.();
      worker.postMessage(next.job);
    }
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
    worker.on("message", (outcome: RunJobOutcome) => {
      const current = this.busy.get(worker);
      this.busy.delete(worker);
      this.idle.push(worker);
      current?.resolve(outcome);
      this.pump();
    });
    worker.on("error", (error) => {
      const current = this.busy.get(worker);
      this.busy.delete(worker);
      this.workersStarted -= 1;
      // The job in hand is retried inline; it never silently disappears.
      if (current) this.queue.unshift(current);
      this.fallBackToInline(error);
    });
    // Idle workers must not keep a script (tsx, tests) alive.
    worker.unref();
    return worker;
  }

  private fallBackToInline(error: unknown): void {
    if (this.mode === "inline") return;
    console.error("run pool: worker threads unavailable, running scenarios inline", error);
    this.mode = "inline";
    void this.pumpInline();
  }

  private async pumpInline(): Promise<void> {
    if (this.inlineRunning) return;
    this.inlineRunning = true;
    try {
      while (this.queue.length > 0) {
        const next = this.queue.shift()!;
        next.onStart?.();
        // Let waiting requests (and SSE writes) through before each replay.
        await yieldToEventLoop();
        next.resolve(executeRunJob(next.job));
      }
    } finally {
      this.inlineRunning = false;
    }
  }

  async close(): Promise<void> {
    const workers = [...this.idle, ...this.busy.keys()];
    this.idle.length = 0;
    this.busy.clear();
    await Promise.all(workers.map((worker) => worker.terminate()));
  }
}

export function createRunPool(
  options: { mode?: "workers" | "inline"; size?: number } = {},
): RunPool {
  return new Pool(options.mode ?? defaultMode(), options.size ?? workerCount());
}

// One pool per server process; kept on globalThis so a dev-server reload does
// not start another set of threads.
const globalForPool = globalThis as typeof globalThis & { __benchlineRunPool?: RunPool };

export function getRunPool(): RunPool {
  globalForPool.__benchlineRunPool ??= createRunPool();
  return globalForPool.__benchlineRunPool;
}
