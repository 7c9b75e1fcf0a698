import fc from "fast-check";
import type { z } from "zod";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { defaultBodyLimitBytes, documentBodyLimitBytes } from "@/app/_lib/http";
import {
  benchDocument,
  call,
  appOrigin,
  cookieFor,
  createWorld,
  databaseSnapshot,
  destroyWorld,
  scenarioDocument,
  type World,
} from "./support/world";

/**
 * Every route that reads a body: malformed JSON, wrong types, unknown fields,
 * oversize bodies, deep nesting, huge strings, other charsets and duplicate
 * keys are refused with a 4xx and a message, and the database is left exactly
 * as it was. Bodies are generated with fast-check; every case expects one
 * exact 4xx, so a 5xx (a crash, a stack overflow) fails it.
 */

interface WriteRoute {
  readonly name: string;
  readonly load: () => Promise<Record<string, unknown>>;
  readonly method: "POST" | "PATCH";
  readonly params?: (w: World) => Record<string, string>;
  readonly schema: () => Promise<z.ZodType>;
  readonly validBody: (w: World) => Record<string, unknown>;
  readonly limit: number;
}

const writeRoutes: readonly WriteRoute[] = [
  {
    name: "POST /api/session",
    load: () => import("@/app/api/session/route"),
    method: "POST",
    schema: async () => (await import("@/app/api/session/schema")).signInBodySchema,
    validBody: () => ({ email: "admin@a.example", password: "x" }),
    limit: defaultBodyLimitBytes,
  },
  {
    name: "PATCH /api/session",
    load: () => import("@/app/api/session/route"),
    method: "PATCH",
    schema: async () => (await import("@/app/api/session/schema")).switchWorkspaceBodySchema,
    validBody: (w) => ({ workspaceId: w.a.workspaceId }),
    limit: defaultBodyLimitBytes,
  },
  {
    name: "POST /api/session/password-reset",
    load: () => import("@/app/api/session/password-reset/route"),
    method: "POST",
    schema: async () =>
      (await import("@/app/api/session/password-reset/schema")).requestResetBodySchema,
    validBody: () => ({ email: "nobody@a.example" }),
    limit: defaultBodyLimitBytes,
  },
  {
    name: "POST /api/session/password-reset/complete",
    load: () => import("@/app/api/session/password-reset/complete/route"),
    method: "POST",
    schema: async () =>
      (await import("@/app/api/session/password-reset/schema")).completeResetBodySchema,
    validBody: () => ({ token: "t".repeat(43), password: "a-long-enough-password" }),
    limit: defaultBodyLimitBytes,
  },
  {
    name: "POST /api/benches",
    load: () => import("@/app/api/benches/route"),
    method: "POST",
    schema: async () => (await import("@/app/api/benches/schema")).createBenchBodySchema,
    validBody: () => ({ document: benchDocument() }),
    limit: documentBodyLimitBytes,
  },
  {
    name: "PATCH /api/benches/[benchId]",
    load: () => import("@/app/api/benches/[benchId]/route"),
    method: "PATCH",
    params: (w) => ({ benchId: w.a.benchId }),
    schema: async () => (await import("@/app/api/benches/[benchId]/schema")).updateBenchBodySchema,
    validBody: () => ({ name: "Renamed" }),
    limit: documentBodyLimitBytes,
  },
  {
    name: "POST /api/benches/[benchId]/duplicate",
    load: () => import("@/app/api/benches/[benchId]/duplicate/route"),
    method: "POST",
    params: (w) => ({ benchId: w.a.benchId }),
    schema: async () =>
      (await import("@/app/api/benches/[benchId]/duplicate/schema")).duplicateBenchBodySchema,
    validBody: () => ({ name: "Copy" }),
    limit: defaultBodyLimitBytes,
  },
  {
    name: "POST /api/scenarios",
    load: () => import("@/app/api/scenarios/route"),
    method: "POST",
    schema: async () => (await import("@/app/api/scenarios/schema")).createScenarioBodySchema,
    validBody: (w) => ({ benchId: w.a.benchId, document: scenarioDocument() }),
    limit: documentBodyLimitBytes,
  },
  {
    name: "PATCH /api/scenarios/[scenarioId]",
    load: () => import("@/app/api/scenarios/[scenarioId]/route"),
    method: "PATCH",
    params: (w) => ({ scenarioId: w.a.scenarioId }),
    schema: async () =>
      (await import("@/app/api/scenarios/[scenarioId]/schema")).updateScenarioBodySchema,
    validBody: () => ({ name: "Renamed" }),
    limit: documentBodyLimitBytes,
  },
  {
    name: "POST /api/suites",
    load: () => import("@/app/api/suites/route"),
    method: "POST",
    schema: async () => (await import("@/app/api/suites/schema")).createSuiteBodySchema,
    validBody: (w) => ({ name: "Suite", scenarioIds: [w.a.scenarioId] }),
    limit: defaultBodyLimitBytes,
  },
  {
    name: "PATCH /api/suites/[suiteId]",
    load: () => import("@/app/api/suites/[suiteId]/route"),
    method: "PATCH",
    params: (w) => ({ suiteId: w.a.suiteId }),
    schema: async () => (await import("@/app/api/suites/[suiteId]/schema")).updateSuiteBodySchema,
    validBody: () => ({ name: "Renamed" }),
    limit: defaultBodyLimitBytes,
  },
  {
    name: "POST /api/runs",
    load: () => import("@/app/api/runs/route"),
    method: "POST",
    schema: async () => (await import("@/app/api/runs/schema")).startRunBodySchema,
    validBody: (w) => ({ scenarioId: w.a.scenarioId }),
    limit: defaultBodyLimitBytes,
  },
  {
    name: "PATCH /api/members/[membershipId]",
    load: () => import("@/app/api/members/[membershipId]/route"),
    method: "PATCH",
    params: () => ({ membershipId: "m" }),
    schema: async () =>
      (await import("@/app/api/members/[membershipId]/schema")).changeRoleBodySchema,
    validBody: () => ({ role: "qa" }),
    limit: defaultBodyLimitBytes,
  },
  {
    name: "POST /api/invitations",
    load: () => import("@/app/api/invitations/route"),
    method: "POST",
    schema: async () => (await import("@/app/api/invitations/schema")).createInvitationBodySchema,
    validBody: () => ({ email: "new@a.example", role: "qa" }),
    limit: defaultBodyLimitBytes,
  },
  {
    name: "POST /api/invitations/accept",
    load: () => import("@/app/api/invitations/accept/route"),
    method: "POST",
    schema: async () =>
      (await import("@/app/api/invitations/accept/schema")).acceptInvitationBodySchema,
    validBody: () => ({ token: "t".repeat(43), name: "New", password: "a-long-enough-password" }),
    limit: defaultBodyLimitBytes,
  },
];

type Handler = (
  request: Request,
  context: { params: Promise<Record<string, string>> },
) => Promise<Response>;

let world: World;
let adminCookie: string;
beforeAll(async () => {
  world = createWorld();
  adminCookie = await cookieFor(world.users.admin.userId, world.a.workspaceId);
});
afterAll(() => destroyWorld(world));

interface ErrorBody {
  error: { code: string; message: string; field?: string };
}

async function send(route: WriteRoute, rawBody: string, headers: Record<string, string> = {}) {
  const handlers = await route.load();
  const params = route.params?.(world) ?? {};
  const path = `/api/x`;
  return call(handlers[route.method], {
    method: route.method,
    path,
    params,
    cookie: adminCookie,
    rawBody,
    headers,
  });
}

const notJson = fc.string({ maxLength: 60 }).filter((text) => {
  try {
    JSON.parse(text);
    return false;
  } catch {
    return true;
  }
});

const wrongValue = fc.oneof(
  fc.integer(),
  fc.boolean(),
  fc.constant(null),
  fc.array(fc.integer(), { maxLength: 3 }),
  fc.dictionary(fc.string({ maxLength: 5 }), fc.integer(), { maxKeys: 2 }),
  fc.string({ maxLength: 10 }),
);

describe.each(writeRoutes)("$name refuses bad input with 400 and changes nothing", (route) => {
  it("malformed JSON", async () => {
    await fc.assert(
      fc.asyncProperty(notJson, async (text) => {
        const before = databaseSnapshot();
        const response = await send(route, text);
        expect(response.status).toBe(400);
        const body = (await response.json()) as ErrorBody;
        expect(body.error.code).toBe("invalid_json");
        expect(body.error.message).toMatch(/not valid JSON/);
        expect(databaseSnapshot()).toBe(before);
      }),
      { numRuns: 15 },
    );
  });

  it("wrong types and shapes (fields replaced by values of other types, or no object at all)", async () => {
    const schema = await route.schema();
    const valid = route.validBody(world);
    const keys = Object.keys(valid);
    const mutated = fc.oneof(
      fc
        .record({ key: fc.constantFrom(...keys), value: wrongValue })
        .map(({ key, value }) => ({ ...valid, [key]: value })),
      fc.oneof(
        fc.integer(),
        fc.string(),
        fc.constant(null),
        fc.array(fc.anything(), { maxLength: 3 }),
      ),
    );
    await fc.assert(
      fc.asyncProperty(
        mutated.filter((body) => !schema.safeParse(body).success),
        async (body) => {
          const before = databaseSnapshot();
          const response = await send(route, JSON.stringify(body));
          expect(response.status).toBe(400);
          const error = ((await response.json()) as ErrorBody).error;
          expect(error.code).toBe("invalid_input");
          expect(error.message.length).toBeGreaterThan(0);
          expect(typeof error.field).toBe("string");
          expect(databaseSnapshot()).toBe(before);
        },
      ),
      { numRuns: 25 },
    );
  });

  it("unknown fields, each named", async () => {
    const valid = route.validBody(world);
    await fc.assert(
      fc.asyncProperty(
        fc
          .stringMatching(/^[a-zA-Z][a-zA-Z0-9_]{0,11}$/)
          .filter(
            (key) =>
              !(key in valid) &&
              ![
                "name",
                "description",
                "document",
                "summary",
                "baseRevision",
                "private",
                "scenarioIds",
                "suiteId",
                "seed",
                "benchRevisionId",
                "scenarioId",
              ].includes(key),
          ),
        wrongValue,
        async (key, value) => {
          const before = databaseSnapshot();
          const response = await send(route, JSON.stringify({ ...valid, [key]: value }));
          expect(response.status).toBe(400);
          const error = ((await response.json()) as ErrorBody).error;
          expect(error.field).toBe(key);
          expect(error.message).toContain(`unknown field "${key}"`);
          expect(databaseSnapshot()).toBe(before);
        },
      ),
      { numRuns: 10 },
    );
  });

  it("oversize bodies", async () => {
    const before = databaseSnapshot();
    const padding = "x".repeat(route.limit + 1);
    const response = await send(
      route,
      JSON.stringify({ ...route.validBody(world), name: padding }),
    );
    expect(response.status).toBe(413);
    const error = ((await response.json()) as ErrorBody).error;
    expect(error.code).toBe("body_too_large");
    expect(error.message).toMatch(/larger than/);
    expect(databaseSnapshot()).toBe(before);
  });

  it("deep nesting (65 to 3,000 levels) in any field: 400 naming that field", async () => {
    const valid = route.validBody(world);
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom(...Object.keys(valid), "extra"),
        fc.integer({ min: 65, max: 3000 }),
        fc.boolean(),
        async (key, depth, asObjects) => {
          const nest = asObjects
            ? `${'{"a":'.repeat(depth)}1${"}".repeat(depth)}`
            : `${"[".repeat(depth)}1${"]".repeat(depth)}`;
          const text = JSON.stringify({ ...valid, [key]: "@@" }).replace('"@@"', nest);
          const before = databaseSnapshot();
          const response = await send(route, text);
          expect(response.status).toBe(400);
          const error = ((await response.json()) as ErrorBody).error;
          expect(error.field?.startsWith(key)).toBe(true);
          expect(error.message).toMatch(/nested deeper than 64 levels/);
          expect(databaseSnapshot() === before).toBe(true);
        },
      ),
      { numRuns: 8 },
    );
  });

  it("huge strings in any field: refused, nothing stored", async () => {
    const valid = route.validBody(world);
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom(...Object.keys(valid)),
        fc.integer({ min: 5_000, max: 70_000 }),
        fc.constantFrom("x", "é", "😀", "\u0000", "\u202e", " "),
        async (key, length, unit) => {
          const text = JSON.stringify({ ...valid, [key]: "@@" }).replace(
            '"@@"',
            `"${unit.repeat(length)}"`,
          );
          const before = databaseSnapshot();
          const response = await send(route, text);
          expect([400, 413]).toContain(response.status);
          const error = ((await response.json()) as ErrorBody).error;
          expect(error.message.length).toBeGreaterThan(0);
          expect(databaseSnapshot() === before).toBe(true);
        },
      ),
      { numRuns: 6 },
    );
  });

  it("a charset other than UTF-8 (415), and UTF-16 bytes sent as JSON (400)", async () => {
    const valid = JSON.stringify(route.validBody(world));
    const before = databaseSnapshot();
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom("utf-16", "UTF-16LE", "iso-8859-1", "shift_jis", "x-unknown", '""'),
        async (charset) => {
          const response = await send(route, valid, {
            "content-type": `application/json; charset=${charset}`,
          });
          expect(response.status).toBe(415);
          expect(((await response.json()) as ErrorBody).error.message).toMatch(/UTF-8/);
        },
      ),
      { numRuns: 6 },
    );
    const handlers = await route.load();
    const utf16 = await (handlers[route.method] as Handler)(
      new Request(`${appOrigin}/api/x`, {
        method: route.method,
        headers: { origin: appOrigin, cookie: adminCookie, "content-type": "application/json" },
        body: Buffer.from(valid, "utf16le"),
      }),
      { params: Promise.resolve(route.params?.(world) ?? {}) },
    );
    expect(utf16.status).toBe(400);
    expect(databaseSnapshot() === before).toBe(true);
  });

  it("duplicate keys: 400 naming the field given twice", async () => {
    const valid = route.validBody(world);
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom(...Object.keys(valid)),
        fc.oneof(wrongValue, fc.constant(valid[Object.keys(valid)[0]!] ?? null)),
        async (key, first) => {
          const rest = JSON.stringify(valid).slice(1);
          const text = `{${JSON.stringify(key)}:${JSON.stringify(first)},${rest}`;
          const before = databaseSnapshot();
          const response = await send(route, text);
          expect(response.status).toBe(400);
          const error = ((await response.json()) as ErrorBody).error;
          expect(error.field).toBe(key);
          expect(error.message).toMatch(/appears twice/);
          expect(databaseSnapshot() === before).toBe(true);
        },
      ),
      { numRuns: 8 },
    );
  });

  it("a body that is not declared as JSON (415) or comes from another origin (403)", async () => {
    const before = databaseSnapshot();
    const valid = JSON.stringify(route.validBody(world));
    expect((await send(route, valid, { "content-type": "text/plain" })).status).toBe(415);
    const handlers = await route.load();
    for (const origin of ["http://elsewhere.example", null]) {
      const response = await call(handlers[route.method], {
        method: route.method,
        path: "/api/x",
        params: route.params?.(world) ?? {},
        cookie: adminCookie,
        rawBody: valid,
        origin,
      });
      expect(response.status).toBe(403);
      expect(((await response.json()) as ErrorBody).error.code).toBe("bad_origin");
    }
    expect(databaseSnapshot()).toBe(before);
  });
});

describe("documents are checked by the engine", () => {
  it("names the field at fault in a bench document", async () => {
    const { POST } = await import("@/app/api/benches/route");
    const document = benchDocument();
    (document.links ?? [])[0]!.groupAddress = "9/9/9";
    const before = databaseSnapshot();
    const response = await call(POST, {
      method: "POST",
      path: "/api/benches",
      cookie: adminCookie,
      body: { document },
    });
    expect(response.status).toBe(400);
    const error = ((await response.json()) as ErrorBody).error;
    expect(error.field).toMatch(/^document\.links\[0\]/);
    expect(databaseSnapshot()).toBe(before);
  });

  it("names the step at fault in a scenario document", async () => {
    const { POST } = await import("@/app/api/scenarios/route");
    const document = { ...scenarioDocument(), steps: [{ kind: "wait", for: "soon" }] };
    const response = await call(POST, {
      method: "POST",
      path: "/api/scenarios",
      cookie: adminCookie,
      body: { benchId: world.a.benchId, document },
    });
    expect(response.status).toBe(400);
    expect(((await response.json()) as ErrorBody).error.field).toBe("document.steps[0].for");
  });

  it("refuses a stale revision with 409 and keeps the history", async () => {
    const { PATCH, GET } = await import("@/app/api/benches/[benchId]/route");
    const params = { benchId: world.a.benchId };
    const first = await call(PATCH, {
      method: "PATCH",
      path: "/api/x",
      params,
      cookie: adminCookie,
      body: { document: benchDocument("Two"), baseRevision: 1 },
    });
    expect(first.status).toBe(200);
    const stale = await call(PATCH, {
      method: "PATCH",
      path: "/api/x",
      params,
      cookie: adminCookie,
      body: { document: benchDocument("Other"), baseRevision: 1 },
    });
    expect(stale.status).toBe(409);
    const revisions = await import("@/app/api/benches/[benchId]/revisions/route");
    const history = (await (
      await call(revisions.GET, { method: "GET", path: "/api/x", params, cookie: adminCookie })
    ).json()) as { revisions: { number: number }[] };
    expect(history.revisions.map((r) => r.number)).toEqual([2, 1]);
    const current = (await (
      await call(GET, { method: "GET", path: "/api/x", params, cookie: adminCookie })
    ).json()) as { revision: { document: { name: string } } };
    expect(current.revision.document.name).toBe("Two");
  });
});
