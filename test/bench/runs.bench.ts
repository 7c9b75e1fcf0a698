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
import { type ChildProcess, spawn, spawnSync } from "node:child_process";
import { randomBytes } from "node:crypto";
import { existsSync, mkdtempSync, rmSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";
import { performance } from "node:perf_hooks";
import { fileURLToPath } from "node:url";
import { openDatabase } from "../../db/client";
import { seedDemoWorld } from "../../db/seed";

const SUITE_RUNS = 50;
const projectRoot = fileURLToPath(new URL("../..", import.meta.url));
const nextBin = path.join(projectRoot, "node_modules/next/dist/bin/next");

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const address = server.address();
      server.close(() =>
        address && typeof address === "object"
          ? resolve(address.port)
          : reject(new Error("no port")),
      );
    });
  });
}

const pause = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

async function startServer(executor: "workers" | "inline") {
  const dir = mkdtempSync(path.join(tmpdir(), "benchline-bench-runs-"));
  const databaseUrl = path.join(dir, "bench.db");
  const db = openDatabase(databaseUrl);
  seedDemoWorld(db);
  db.$client.close();
  const port = await freePort();
  const baseURL = `http://127.0.0.1:${port}`;
  let output = "";
  const server: ChildProcess = spawn(
    process.execPath,
    [nextBin, "start", "--port", String(port), "--hostname", "127.0.0.1"],
    {
      cwd: projectRoot,
      env: {
        ...process.env,
        NODE_ENV: "production",
        NEXT_TELEMETRY_DISABLED: "1",
        DATABASE_URL: databaseUrl,
        SESSION_SECRET: randomBytes(32).toString("base64url"),
        SESSION_COOKIE_SECURE: "false",
        APP_URL: baseURL,
        RUN_EXECUTOR: executor,
      },
      stdio: ["ignore", "pipe", "pipe"],
    },
  );
  server.stdout?.on("data", (chunk: Buffer) => (output += chunk.toString()));
  server.stderr?.on("data", (chunk: Buffer) => (output += chunk.toString()));
  const deadline = Date.now() + 90_000;
  for (;;) {
    if (server.exitCode !== null) throw new Error(`next start exited:\n${output}`);
    try {
      if ((await fetch(`${baseURL}/api/health`)).ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) throw new Error(`next start did not answer:\n${output}`);
    await pause(200);
  }
  const stop = async () => {
    const exited = new Promise((resolve) => server.once("exit", resolve));
    server.kill("SIGTERM");
    await Promise.race([exited, pause(5_000)]);
    if (server.exitCode === null) server.kill("SIGKILL");
    rmSync(dir, { recursive: true, force: true });
  };
  return { baseURL, stop, output: () => output };
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

if (!existsSync(path.join(projectRoot, ".next/BUILD_ID"))) {
  console.log("bench:runs: no production build yet, running next build ...");
  const build = spawnSync(process.execPath, [nextBin, "build"], {
    cwd: projectRoot,
    env: { ...process.env, NODE_ENV: "production", NEXT_TELEMETRY_DISABLED: "1" },
    stdio: "inherit",
  });
  if (build.status !== 0) process.exit(build.status ?? 1);
}

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
