import { type ChildProcess, spawn, spawnSync } from "node:child_process";
import { randomBytes } from "node:crypto";
import { existsSync, mkdtempSync, readdirSync, rmSync, statSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import type { TestProject } from "vitest/node";
import { openDatabase } from "../../db/client";
import { seedDemoWorld } from "../../db/seed";
import { seedDemoHistory } from "../../app/_lib/demo/seed-demo-history";

declare module "vitest" {
  export interface ProvidedContext {
    /** Where the app under test is served, e.g. "http://127.0.0.1:41234". */
    baseURL: string;
  }
}

const projectRoot = fileURLToPath(new URL("../..", import.meta.url));
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

function freePort(): Promise<number> {
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

export default async function setup(project: TestProject) {
  const env = { ...process.env, NEXT_TELEMETRY_DISABLED: "1" };

  if (buildIsStale()) {
    console.log("e2e: building the app (next build) ...");
    const build = spawnSync(process.execPath, [nextBin, "build"], {
      cwd: projectRoot,
      env: { ...env, NODE_ENV: "production" },
      stdio: "inherit",
    });
    if (build.status !== 0) throw new Error(`next build failed with code ${build.status}`);
  }

  // A fresh database for this run, migrated and seeded like the demo.
  const dataDir = mkdtempSync(path.join(tmpdir(), "benchline-e2e-"));
  const databaseUrl = path.join(dataDir, "e2e.db");
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
        ...env,
        NODE_ENV: "production",
        DATABASE_URL: databaseUrl,
        // Production refuses to run sessions without a secret, and marks the
        // cookie Secure, which a browser drops over this plain-http loopback.
        SESSION_SECRET: randomBytes(32).toString("base64url"),
        SESSION_COOKIE_SECURE: "false",
        APP_URL: baseURL,
      },
      stdio: ["ignore", "pipe", "pipe"],
    },
  );
  server.stdout?.on("data", (chunk: Buffer) => (output += chunk.toString()));
  server.stderr?.on("data", (chunk: Buffer) => (output += chunk.toString()));

  try {
    await waitUntilServing(baseURL, server, () => output);
  } catch (error) {
    server.kill("SIGTERM");
    rmSync(dataDir, { recursive: true, force: true });
    throw error;
  }
  project.provide("baseURL", baseURL);

  return async () => {
    if (server.exitCode === null) {
      const exited = new Promise((resolve) => server.once("exit", resolve));
      server.kill("SIGTERM");
      await Promise.race([exited, new Promise((resolve) => setTimeout(resolve, 5_000))]);
      if (server.exitCode === null) server.kill("SIGKILL");
    }
    rmSync(dataDir, { recursive: true, force: true });
  };
}
