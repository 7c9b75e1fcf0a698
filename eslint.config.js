import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

// The dependency rule of the house style, enforced here so a wrong import fails CI:
// engine -> zod only; db -> engine; components -> engine (never db); app -> anything.
const nodeBuiltins = [
  "node:*",
  "fs",
  "path",
  "os",
  "crypto",
  "child_process",
  "worker_threads",
  "http",
  "net",
];

// One way into the engine: outside engine/, import it only from its public entry
// (engine/index.ts, "@/engine") or the command line (engine/cli).
const engineOneWayIn = {
  group: [
    "@/engine/*",
    "!@/engine/cli",
    "!@/engine/cli/*",
    "**/engine/*",
    "!**/engine/cli",
    "!**/engine/cli/*",
  ],
  message: 'Import the engine from "@/engine" (engine/index.ts), its one public entry.',
};

const config = [
  ...nextVitals,
  ...nextTs,
  { ignores: [".next/**", "node_modules/**", "data/**", "db/migrations/**", "next-env.d.ts"] },
  {
    files: ["engine/**/*.ts"],
    ignores: ["engine/cli/**"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          patterns: [
            {
              group: [
                "react",
                "react-dom",
                "next",
                "next/*",
                "drizzle-orm",
                "drizzle-orm/*",
                "better-sqlite3",
              ],
              message: "engine/ is pure TypeScript: it depends on zod only.",
            },
            {
              group: [
                "@/app/*",
                "@/components/*",
                "@/db/*",
                "**/app/*",
                "**/components/*",
                "**/db/*",
              ],
              message: "engine/ must not import from app/, components/ or db/.",
            },
            {
              group: nodeBuiltins,
              message:
                "engine/ runs in the browser and workers: no Node built-ins outside engine/cli/.",
            },
          ],
        },
      ],
      "no-restricted-globals": [
        "error",
        { name: "setTimeout", message: "engine/ uses the virtual clock, never wall-clock timers." },
        {
          name: "setInterval",
          message: "engine/ uses the virtual clock, never wall-clock timers.",
        },
        { name: "performance", message: "engine/ never reads wall-clock time." },
        { name: "process", message: "engine/ is free of Node globals." },
      ],
      "no-restricted-properties": [
        "error",
        {
          object: "Math",
          property: "random",
          message: "Use the engine's seeded generator (engine/core/rng).",
        },
        { object: "Date", property: "now", message: "engine/ never reads wall-clock time." },
      ],
      "no-restricted-syntax": [
        "error",
        {
          selector: "NewExpression[callee.name='Date']",
          message: "engine/ never reads wall-clock time.",
        },
      ],
    },
  },
  {
    files: ["db/**/*.ts"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          patterns: [
            {
              group: ["next", "next/*", "react", "react-dom", "@/app/*", "@/components/*"],
              message: "db/ runs from a CLI and tests too: no Next, React or UI imports.",
            },
            engineOneWayIn,
          ],
        },
      ],
    },
  },
  {
    files: ["components/**/*.ts", "components/**/*.tsx"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          patterns: [
            {
              group: ["@/db/*", "**/db/*", "better-sqlite3", "drizzle-orm", "drizzle-orm/*"],
              message: "components/ never reach the database; pages fetch and pass props.",
            },
            engineOneWayIn,
          ],
        },
      ],
    },
  },
  {
    files: ["app/**/*.ts", "app/**/*.tsx", "test/**/*.ts", "proxy.ts"],
    rules: { "no-restricted-imports": ["error", { patterns: [engineOneWayIn] }] },
  },
];
export default config;
