import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

const root = fileURLToPath(new URL(".", import.meta.url));

// Two projects: node for the engine, db and API tests; jsdom for React components.
// Browser tests (test/e2e) have their own config because they build and serve the app.
export default defineConfig({
  resolve: { alias: { "@": root } },
  test: {
    projects: [
      {
        extends: true,
        test: {
          name: "node",
          environment: "node",
          include: [
            "engine/**/*.test.ts",
            "db/**/*.test.ts",
            "app/**/*.test.ts",
            "test/**/*.test.ts",
            // Pure logic beside components (models, protocols, filters) runs in node.
            "components/**/*.test.ts",
          ],
          exclude: ["test/e2e/**", "node_modules/**"],
        },
      },
      {
        extends: true,
        test: {
          name: "dom",
          environment: "jsdom",
          include: ["components/**/*.test.tsx"],
        },
      },
    ],
  },
});
