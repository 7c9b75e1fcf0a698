/**
 * Worker-thread entry of the run pool. Next bundles this file (and the engine
 * it imports) as its own chunk because run-pool.ts creates it with
 * `new Worker(new URL("./run-worker.ts", import.meta.url))`; see run-pool.ts.
 */
import { parentPort } from "node:worker_threads";
import { executeRunJob } from "./execute-run-job";
import type { RunJob } from "./run-job";

if (!parentPort) throw new Error("run-worker.ts must run as a worker thread");
const port = parentPort;
port.on("message", (job: RunJob) => {
  port.postMessage(executeRunJob(job));
});
