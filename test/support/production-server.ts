import { type ChildProcess, spawn, spawnSync } from "node:child_process";
import { randomBytes } from "node:crypto";
import { existsSync, mkdtempSync, readdirSync, rmSync, statSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { openDatabase } from "../../db/client";
import { seedDemoWorld } from "../../db/seed";
import { seedDemoHistory } from "../../app/_lib/demo/seed-demo-history";

/**
 * Serving the production build for tests and benchmarks (the browser tests'
 * global setup, bench:runs, bench:load): build when stale, a fresh seeded
 * database in a temp folder, `next start` on 127.0.0.1 on a free port.
 */

export const projectRoot = fileURLToPath(new URL("../..", import.meta.url));
const nextBin = path.join(projectRoot, "node_modules/next/dist/bin/next");

// Everything that ends up in the production build; a change to any of them makes
// the existing .next/ stale.
const buildInputs = [
  "app",
  "components",
  "engine",
  "db",
  "public",
  "scenarios",
  "proxy.ts",
  "instrumentation.ts",
  "next.config.ts",
  "postcss.config.mjs",
  "tsconfig.json",
  "package.json",
  "package-lock.json",
];

function newestMtimeMs(entry: string): number {
  if (!existsSync(entry)) return 0;
  const stats = statSync(entry);
  if (!stats.isDirectory()) return stats.mtimeMs;
  let newest = stats.mtimeMs;
  for (const child of readdirSync(entry)) {
    if (child === "node_modules" || child.startsWith(".")) continue;
    newest = Math.max(newest, newestMtimeMs(path.join(entry, child)));
  }
  return newest;
}

function buildIsStale(): boolean {
  const buildId = path.join(projectRoot, ".next/BUILD_ID");
  if (!existsSync(buildId)) return true;
  const builtAt = statSync(buildId).mtimeMs;
  return buildInputs.some((input) => newestMtimeMs(path.join(projectRoot, input)) > builtAt);
}

/** Run `next build` when .next/ is missing or older than any build input. */
export function buildIfStale(label: string): void {
  if (!buildIsStale()) return;
  console.log(`${label}: building the app (next build) ...`);
  const build = spawnSync(process.execPath, [nextBin, "build"], {
    cwd: projectRoot,
    env: { ...process.env, NODE_ENV: "production", NEXT_TELEMETRY_DISABLED: "1" },
    stdio: "inherit",
  });
  if (build.status !== 0) throw new Error(`next build failed with code ${build.status}`);
}

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const address = server.address();
      server.close(() => {
        if (address && typeof address === "object") resolve(address.port);
        else reject(new Error("could not find a free port"));
      });
    });
  });
}

async function waitUntilServing(url: string, server: ChildProcess, output: () => string) {
  const deadline = Date.now() + 90_000;
  while (Date.now() < deadline) {
    if (server.exitCode !== null) {
      throw new Error(`next start exited with code ${server.exitCode}:\n${output()}`);
    }
    try {
      const response = await fetch(url);
      if (response.ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  throw new Error(`next start did not answer ${url} within 90 s:\n${output()}`);
}

export interface ProductionServer {
  /** e.g. "http://127.0.0.1:41234" */
  readonly baseURL: string;
  readonly databaseUrl: string;
  /** Everything the server printed so far. */
  output(): string;
  /** Stop the server (SIGTERM, then SIGKILL after 5 s) and remove its database. */
  stop(): Promise<void>;
}

/**
 * A fresh database migrated and seeded like the demo, and `next start` serving
 * the existing build against it. `env` adds server settings (RUN_EXECUTOR, limits).
 */
export async function startProductionServer(
  options: { label: string; env?: Record<string, string> } = { label: "server" },
): Promise<ProductionServer> {
  const dataDir = mkdtempSync(path.join(tmpdir(), `benchline-${options.label}-`));
  const databaseUrl = path.join(dataDir, "app.db");
  const db = openDatabase(databaseUrl);
  seedDemoWorld(db);
  await seedDemoHistory(db);
  db.$client.close();

  const port = await freePort();
  const baseURL = `http://127.0.0.1:${port}`;
  let output = "";
  const server = spawn(
    process.execPath,
    [nextBin, "start", "--port", String(port), "--hostname", "127.0.0.1"],
    {
      cwd: projectRoot,
      env: {
        ...process.env,
        NEXT_TELEMETRY_DISABLED: "1",
        NODE_ENV: "production",
        DATABASE_URL: databaseUrl,
        // Production refuses to run sessions without a secret, and marks the
        // cookie Secure, which a client drops over this plain-http loopback.
        SESSION_SECRET: randomBytes(32).toString("base64url"),
        SESSION_COOKIE_SECURE: "false",
        APP_URL: baseURL,
        ...options.env,
      },
      stdio: ["ignore", "pipe", "pipe"],
    },
  );
  server.stdout?.on("data", (chunk: Buffer) => (output += chunk.toString()));
  server.stderr?.on("data", (chunk: Buffer) => (output += chunk.toString()));

  const stop = async () => {
    if (server.exitCode === null && server.signalCode === null) {
      const exited = new Promise((resolve) => server.once("exit", resolve));
      server.kill("SIGTERM");
      await Promise.race([exited, new Promise((resolve) => setTimeout(resolve, 5_000))]);
      if (server.exitCode === null && server.signalCode === null) server.kill("SIGKILL");
    }
    rmSync(dataDir, { recursive: true, force: true });
  };
  try {
    await waitUntilServing(baseURL, server, () => output);
  } catch (error) {
    await stop();
    throw error;
  }
  return { baseURL, databaseUrl, output: () => output, stop };
}
