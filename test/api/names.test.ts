import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  benchDocument,
  call,
  cookieFor,
  createWorld,
  databaseSnapshot,
  destroyWorld,
  scenarioDocument,
  type World,
} from "./support/world";

/**
 * Every name a request gives (bench, scenario, suite, lab title, a new
 * member's display name, and a document's own name where it becomes the
 * stored name) is refused with 400 naming the field when it holds NUL, a lone
 * surrogate or a bidirectional control, and nothing is stored.
 */

const badNames = {
  nul: "Hall\u0000light",
  "lone surrogate": "Hall \ud800 light",
  "right-to-left override": "Hall \u202egnp.exe",
  "first strong isolate": "Hall \u2068light",
  "right-to-left mark": "Hall\u200f light",
  "Arabic letter mark": "Hall\u061c light",
};

interface NameCase {
  readonly name: string;
  readonly load: () => Promise<Record<string, unknown>>;
  readonly method: "POST" | "PATCH";
  readonly role: "admin" | "trainer";
  readonly params?: (w: World) => Record<string, string>;
  readonly body: (w: World, bad: string) => unknown;
  readonly field: string;
}

const cases: readonly NameCase[] = [
  {
    name: "POST /api/benches name",
    load: () => import("@/app/api/benches/route"),
    method: "POST",
    role: "admin",
    body: (_w, bad) => ({ name: bad, document: benchDocument() }),
    field: "name",
  },
  {
    name: "POST /api/benches document name (the bench's name by default)",
    load: () => import("@/app/api/benches/route"),
    method: "POST",
    role: "admin",
    body: (_w, bad) => ({ document: benchDocument(bad) }),
    field: "document.name",
  },
  {
    name: "PATCH /api/benches/[benchId] name",
    load: () => import("@/app/api/benches/[benchId]/route"),
    method: "PATCH",
    role: "admin",
    params: (w) => ({ benchId: w.a.benchId }),
    body: (_w, bad) => ({ name: bad }),
    field: "name",
  },
  {
    name: "POST /api/benches/[benchId]/duplicate name",
    load: () => import("@/app/api/benches/[benchId]/duplicate/route"),
    method: "POST",
    role: "admin",
    params: (w) => ({ benchId: w.a.benchId }),
    body: (_w, bad) => ({ name: bad }),
    field: "name",
  },
  {
    name: "POST /api/scenarios name",
    load: () => import("@/app/api/scenarios/route"),
    method: "POST",
    role: "admin",
    body: (w, bad) => ({ benchId: w.a.benchId, name: bad, document: scenarioDocument() }),
    field: "name",
  },
  {
    name: "POST /api/scenarios document name",
    load: () => import("@/app/api/scenarios/route"),
    method: "POST",
    role: "admin",
    body: (w, bad) => ({ benchId: w.a.benchId, document: scenarioDocument(bad) }),
    field: "document.name",
  },
  {
    name: "PATCH /api/scenarios/[scenarioId] name",
    load: () => import("@/app/api/scenarios/[scenarioId]/route"),
    method: "PATCH",
    role: "admin",
    params: (w) => ({ scenarioId: w.a.scenarioId }),
    body: (_w, bad) => ({ name: bad }),
    field: "name",
  },
  {
    name: "POST /api/suites name",
    load: () => import("@/app/api/suites/route"),
    method: "POST",
    role: "admin",
    body: (w, bad) => ({ name: bad, scenarioIds: [w.a.scenarioId] }),
    field: "name",
  },
  {
    name: "PATCH /api/suites/[suiteId] name",
    load: () => import("@/app/api/suites/[suiteId]/route"),
    method: "PATCH",
    role: "admin",
    params: (w) => ({ suiteId: w.a.suiteId }),
    body: (_w, bad) => ({ name: bad }),
    field: "name",
  },
  {
    name: "POST /api/labs title",
    load: () => import("@/app/api/labs/route"),
    method: "POST",
    role: "trainer",
    body: (w, bad) => ({ title: bad, benchId: w.a.benchId, gradingScenarioId: w.a.scenarioId }),
    field: "title",
  },
  {
    name: "POST /api/invitations/accept name",
    load: () => import("@/app/api/invitations/accept/route"),
    method: "POST",
    role: "admin",
    body: (_w, bad) => ({ token: "t".repeat(43), name: bad, password: "a-long-enough-password" }),
    field: "name",
  },
];

let world: World;
beforeAll(() => {
  world = createWorld();
});
afterAll(() => destroyWorld(world));

describe.each(cases)("$name", (c) => {
  it.each(Object.entries(badNames))(
    "refuses a %s with 400 naming the field",
    async (_kind, bad) => {
      const handlers = await c.load();
      const cookie = await cookieFor(world.users[c.role].userId, world.a.workspaceId);
      const before = databaseSnapshot();
      const response = await call(handlers[c.method], {
        method: c.method,
        path: "/api/x",
        params: c.params?.(world) ?? {},
        cookie,
        body: c.body(world, bad),
      });
      expect(response.status).toBe(400);
      const error = ((await response.json()) as { error: { field: string; message: string } })
        .error;
      expect(error.field).toBe(c.field);
      expect(error.message).toMatch(/may not contain/);
      expect(databaseSnapshot() === before).toBe(true);
    },
  );
});
