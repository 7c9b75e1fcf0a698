/**
 * Server run benchmark: `npm run bench:runs`.
 *
 * Serves the production build (`next start`, built first when .next/ is
 * missing) on a loopback port against a fresh seeded database, signs in as the
 * demo QA member, and starts 50 runs of the Fernhill demo suite through
 * POST /api/runs at once. While they run, a second client keeps asking
 * other API routes (GET /api/scenarios, /api/suites, /api/runs) one after
 * another and records each latency. Printed: scenarios per second, and the
 * p50/p95 latency of those other requests while idle and under the suite
 * load, side by side with their ratio.
 *
 * It runs twice: with the worker-thread pool (the default in a Next server)
 * and with RUN_EXECUTOR=inline (replays on the request thread, yielding
 * between scenarios), to show what moving replays off the event loop buys.
 * Everything stays on 127.0.0.1.
 */
import { performance } from "node:perf_hooks";
import { buildIfStale, startProductionServer } from "../support/production-server";

const SUITE_RUNS = 50;

function startServer(executor: "workers" | "inline") {
  return startProductionServer({
    label: "bench-runs",
    env: {
      RUN_EXECUTOR: executor,
      // This benchmark measures throughput with 50 suite runs from one member at
      // once, far past the per-member and per-workspace limits a real server keeps.
      RUN_LIMIT_PER_MEMBER: String(SUITE_RUNS + 1),
      RUN_LIMIT_PER_WORKSPACE: String(SUITE_RUNS + 1),
    },
  });
}

async function signIn(baseURL: string): Promise<string> {
  const response = await fetch(`${baseURL}/api/session`, {
    method: "POST",
    headers: { "Content-Type": "application/json", Origin: baseURL },
    body: JSON.stringify({ email: "priya.qa@fernhill.example", password: "fernhill-qa-demo" }),
  });
  const cookie = response.headers.get("set-cookie")?.split(";")[0];
  if (!response.ok || !cookie) throw new Error(`sign-in failed: ${response.status}`);
  return cookie;
}

function percentile(values: readonly number[], p: number): number {
  if (values.length === 0) return Number.NaN;
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)]!;
}

/** Other API requests, one after another, until `until` resolves; their latencies in ms. */
async function probe(baseURL: string, cookie: string, until: Promise<unknown>): Promise<number[]> {
  let done = false;
  void until.then(() => (done = true));
  const urls = ["/api/scenarios", "/api/suites", "/api/runs?limit=20"];
  const latencies: number[] = [];
  for (let i = 0; !done; i += 1) {
    const started = performance.now();
    const response = await fetch(`${baseURL}${urls[i % urls.length]}`, { headers: { cookie } });
    await response.arrayBuffer();
    latencies.push(performance.now() - started);
  }
  return latencies;
}

/** Wait for a run's event stream to end (run.finished). */
async function finished(baseURL: string, cookie: string, eventsUrl: string): Promise<void> {
  const response = await fetch(`${baseURL}${eventsUrl}`, { headers: { cookie } });
  const text = await response.text();
  if (!text.includes("event: run.finished"))
    throw new Error(`stream ended early: ${text.slice(0, 200)}`);
}

async function measure(executor: "workers" | "inline") {
  const { baseURL, stop, output } = await startServer(executor);
  try {
    const cookie = await signIn(baseURL);
    const suites = (await (
      await fetch(`${baseURL}/api/suites`, { headers: { cookie } })
    ).json()) as {
      suites: { id: string }[];
    };
    const suiteId = suites.suites[0]!.id;
    // Warm up: one suite run, so compilation and first-use costs are not measured.
    const warm = await fetch(`${baseURL}/api/runs`, {
      method: "POST",
      headers: { cookie, Origin: baseURL, "Content-Type": "application/json" },
      body: JSON.stringify({ suiteId }),
    });
    const warmBody = (await warm.json()) as { eventsUrl: string; runIds: string[] };
    await finished(baseURL, cookie, warmBody.eventsUrl);
    const scenariosPerSuite = warmBody.runIds.length;

    let idleDone: () => void = () => {};
    const idleWindow = new Promise<void>((resolve) => (idleDone = resolve));
    setTimeout(() => idleDone(), 2_000);
    const idle = await probe(baseURL, cookie, idleWindow);

    const started = performance.now();
    const startLatencies: number[] = [];
    const all = Promise.all(
      Array.from({ length: SUITE_RUNS }, async () => {
        const t0 = performance.now();
        const response = await fetch(`${baseURL}/api/runs`, {
          method: "POST",
          headers: { cookie, Origin: baseURL, "Content-Type": "application/json" },
          body: JSON.stringify({ suiteId }),
        });
        startLatencies.push(performance.now() - t0);
        if (response.status !== 202) throw new Error(`start failed: ${response.status}`);
        const body = (await response.json()) as { eventsUrl: string };
        await finished(baseURL, cookie, body.eventsUrl);
      }),
    );
    const loaded = await probe(baseURL, cookie, all);
    await all;
    const seconds = (performance.now() - started) / 1000;
    // The pool says so on the server's stderr when it had to fall back to inline.
    const fellBack = output().includes("running scenarios inline");
    if (executor === "workers" && fellBack)
      console.log("bench:runs: the worker pool fell back to inline!");
    return {
      executor,
      scenarios: SUITE_RUNS * scenariosPerSuite,
      seconds,
      scenariosPerSecond: (SUITE_RUNS * scenariosPerSuite) / seconds,
      startP95: percentile(startLatencies, 95),
      idleP50: percentile(idle, 50),
      idleP95: percentile(idle, 95),
      loadedP50: percentile(loaded, 50),
      loadedP95: percentile(loaded, 95),
      probes: loaded.length,
    };
  } finally {
    await stop();
  }
}

buildIfStale("bench:runs");

const results = [];
for (const executor of ["workers", "inline"] as const) {
  console.log(`bench:runs: ${SUITE_RUNS} suite runs at once, executor ${executor} ...`);
  results.push(await measure(executor));
}
const fmt = (n: number, digits = 1) => n.toFixed(digits).padStart(9);
console.log(`\n${SUITE_RUNS} concurrent runs of the Fernhill demo suite on 127.0.0.1`);
console.log("                                      workers     inline   inline/workers");
const [w, i] = results as [
  Awaited<ReturnType<typeof measure>>,
  Awaited<ReturnType<typeof measure>>,
];
const row = (label: string, a: number, b: number, digits = 1) =>
  console.log(`${label.padEnd(36)}${fmt(a, digits)}  ${fmt(b, digits)}  ${fmt(b / a, 2)}`);
row("scenarios replayed", w.scenarios, i.scenarios, 0);
row("wall time, s", w.seconds, i.seconds, 2);
row("scenarios per second", w.scenariosPerSecond, i.scenariosPerSecond);
row("POST /api/runs p95, ms", w.startP95, i.startP95);
row("other API requests idle p50, ms", w.idleP50, i.idleP50);
row("other API requests idle p95, ms", w.idleP95, i.idleP95);
row("other API requests loaded p50, ms", w.loadedP50, i.loadedP50);
row("other API requests loaded p95, ms", w.loadedP95, i.loadedP95);
row("other API requests answered", w.probes, i.probes, 0);
console.log(
  `\nloaded/idle p95 of other requests: workers ${(w.loadedP95 / w.idleP95).toFixed(2)}x, inline ${(i.loadedP95 / i.idleP95).toFixed(2)}x`,
);
