import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

const root = fileURLToPath(new URL(".", import.meta.url));

// Browser tests: the global setup builds the app when the build is stale, serves
// it with `next start` on a free port against a fresh seeded database, and the
// tests drive Debian's Chromium through playwright-core. One file at a time in a
// single fork, since every test shares one server and the machine is small.
export default defineConfig({
  resolve: { alias: { "@": root } },
  test: {
    name: "e2e",
    environment: "node",
    include: ["test/e2e/**/*.test.ts"],
    globalSetup: ["test/e2e/global-setup.ts"],
    pool: "forks",
    fileParallelism: false,
    maxWorkers: 1,
    testTimeout: 120_000,
    // The first run builds the app inside the global setup.
    hookTimeout: 900_000,
  },
});
