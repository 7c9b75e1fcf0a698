import { readdirSync, statSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { can, capabilities, capabilityTable } from "@/app/_lib/capabilities";
import { liveSessions } from "@/app/_lib/live/live-session-registry";
import { roles, type Role } from "@/db/schema";
import { bodyIdCases, prepareBodyIdCases, secretNames } from "./support/body-ids";
import {
  type GuardedRoute,
  guardedRoutes,
  ownerDecidedRoutes,
  pathOf,
  publicRoutes,
  sessionOnlyRoutes,
} from "./support/routes";
import {
  call,
  type CallOptions,
  cookieFor,
  createWorld,
  benchDocument,
  databaseSnapshot,
  destroyWorld,
  floorPlanSvg,
  type World,
} from "./support/world";

const httpMethods = ["GET", "POST", "PUT", "PATCH", "DELETE"] as const;

/** Every app/api route file as its route pattern ("/api/benches/[benchId]"). */
function routeFiles(dir = "app/api"): string[] {
  const out: string[] = [];
  for (const entry of readdirSync(dir)) {
    const full = path.join(dir, entry);
    if (statSync(full).isDirectory()) out.push(...routeFiles(full));
    else if (entry === "route.ts") out.push(`/${path.dirname(full).replace(/^app\//, "")}`);
  }
  return out;
}

let world: World;
beforeAll(async () => {
  world = createWorld();
  await prepareBodyIdCases(world);
});
afterAll(async () => {
  // The matrix starts live sessions on the server; they run until stopped.
  await liveSessions().shutdown();
  destroyWorld(world);
});

describe("the route list covers every route handler", () => {
  it("lists every exported method of every route.ts (so none escapes the matrix)", async () => {
    const known = new Set(
      [...guardedRoutes, ...publicRoutes, ...sessionOnlyRoutes, ...ownerDecidedRoutes].map(
        (r) => `${r.method} ${r.route}`,
      ),
    );
    const missing: string[] = [];
    for (const route of routeFiles()) {
      const mod = (await import(
        /* @vite-ignore */ `@/app${route.replace(/^\/api/, "/api")}/route`
      )) as Record<string, unknown>;
      for (const method of httpMethods) {
        if (typeof mod[method] === "function" && !known.has(`${method} ${route}`)) {
          missing.push(`${method} ${route}`);
        }
      }
    }
    expect(missing).toEqual([]);
  });

  it("guards routes only with capabilities from the table", () => {
    for (const route of guardedRoutes) expect(capabilities).toContain(route.capability);
  });
});

/** What the capability table says a role gets on a route: allowed, or refused with 403 or 404. */
function expectedFor(route: GuardedRoute, role: Role): "allowed" | 403 | 404 {
  const scope = capabilityTable[route.capability][role];
  const allowed =
    route.reach === "any"
      ? can(role, route.capability)
      : route.reach === "owner"
        ? role === "apprentice" && can(role, route.capability)
        : can(role, route.capability, { scope: "workspace" });
  if (allowed) return "allowed";
  return route.hidesFromOwnScope && scope === "own" ? 404 : 403;
}

/** The call options of one case: its params, body (JSON or raw) and path. */
function requestOf(route: GuardedRoute, extra: Partial<CallOptions> = {}): CallOptions {
  const params = route.params?.(world) ?? {};
  const raw = route.rawBody?.();
  return {
    method: route.method,
    path: pathOf(route.route, params),
    params,
    ...(route.body ? { body: route.body(world) } : {}),
    ...(raw ? { rawBody: raw.text, headers: { "content-type": raw.contentType } } : {}),
    ...extra,
  };
}

describe("each role can do exactly what the capability table allows", () => {
  for (const route of guardedRoutes) {
    for (const role of roles) {
      const scope = capabilityTable[route.capability][role];
      const expected = expectedFor(route, role);
      it(`${role} ${route.method} ${route.route} (${route.capability}: ${scope}, ${route.reach}) -> ${expected}`, async () => {
        const handlers = await route.load();
        const response = await call(
          handlers[route.method],
          requestOf(route, {
            cookie: await cookieFor(world.users[role].userId, world.a.workspaceId),
          }),
        );
        if (expected === "allowed") {
          if (route.stream) {
            // An event stream is checked for its status and type only.
            expect(response.status).toBe(200);
            expect(response.headers.get("content-type")).toMatch(/^text\/event-stream/);
            await response.body?.cancel();
          } else {
            expect(response.status, await response.clone().text()).toBeLessThan(300);
          }
        } else {
          expect(response.status).toBe(expected);
          const body = (await response.json()) as { error: { code: string; message: string } };
          expect(body.error.code).toBe(expected === 403 ? "forbidden" : "not_found");
        }
      });
    }
  }

  it("answers 401 on every guarded route without a session", async () => {
    for (const route of [...guardedRoutes]) {
      const handlers = await route.load();
      const response = await call(handlers[route.method], requestOf(route));
      expect(response.status, `${route.method} ${route.route}`).toBe(401);
    }
  });

  it("lets an apprentice follow and share their own run, though not others'", async () => {
    const cookie = await cookieFor(world.users.apprentice.userId, world.a.workspaceId);
    const runs = await import("@/app/api/runs/route");
    const started = await call(runs.POST, {
      method: "POST",
      path: "/api/runs",
      cookie,
      body: { scenarioId: world.a.scenarioId, benchRevisionId: world.sandboxRevisionId },
    });
    expect(started.status, await started.clone().text()).toBe(202);
    const { runId } = (await started.json()) as { runId: string };
    const events = await import("@/app/api/runs/[runId]/events/route");
    const stream = await call(events.GET, {
      method: "GET",
      path: `/api/runs/${runId}/events`,
      params: { runId },
      cookie,
    });
    expect(stream.status).toBe(200);
    await stream.body?.cancel();
    const share = await import("@/app/api/runs/[runId]/share/route");
    const shared = await call(share.POST, {
      method: "POST",
      path: `/api/runs/${runId}/share`,
      params: { runId },
      cookie,
      body: { to: world.users.trainer.email },
    });
    expect(shared.status, await shared.clone().text()).toBe(202);
  });

  it("lets a trainer invite apprentices only", async () => {
    const { POST } = await import("@/app/api/invitations/route");
    const cookie = await cookieFor(world.users.trainer.userId, world.a.workspaceId);
    for (const role of ["admin", "trainer", "engineer", "qa"]) {
      const response = await call(POST, {
        method: "POST",
        path: "/api/invitations",
        cookie,
        body: { email: `someone-${role}@a.example`, role },
      });
      expect(response.status).toBe(403);
    }
  });

  it("lets an apprentice edit their own sandbox, run on it, and see only their own runs", async () => {
    const cookie = await cookieFor(world.users.apprentice.userId, world.a.workspaceId);
    const bench = await import("@/app/api/benches/[benchId]/route");
    const patched = await call(bench.PATCH, {
      method: "PATCH",
      path: `/api/benches/${world.sandboxBenchId}`,
      params: { benchId: world.sandboxBenchId },
      cookie,
      body: { name: "My sandbox" },
    });
    expect(patched.status).toBe(200);
    const runs = await import("@/app/api/runs/route");
    const started = await call(runs.POST, {
      method: "POST",
      path: "/api/runs",
      cookie,
      body: { scenarioId: world.a.scenarioId, benchRevisionId: world.sandboxRevisionId },
    });
    expect(started.status, await started.clone().text()).toBe(202);
    const listed = (await (
      await call(runs.GET, { method: "GET", path: "/api/runs", cookie })
    ).json()) as {
      runs: { startedBy: string }[];
    };
    expect(listed.runs.length).toBeGreaterThan(0);
    expect(listed.runs.every((run) => run.startedBy === world.users.apprentice.userId)).toBe(true);
  });
});

describe("data never crosses workspaces", () => {
  const crossCases = [
    {
      route: "/api/benches/[benchId]",
      methods: ["GET", "PATCH", "DELETE"],
      params: (w: World) => ({ benchId: w.b.benchId }),
      body: { name: "x" },
    },
    {
      route: "/api/benches/[benchId]/revisions",
      methods: ["GET"],
      params: (w: World) => ({ benchId: w.b.benchId }),
    },
    {
      route: "/api/benches/[benchId]/duplicate",
      methods: ["POST"],
      params: (w: World) => ({ benchId: w.b.benchId }),
      body: {},
    },
    {
      route: "/api/scenarios/[scenarioId]",
      methods: ["GET", "PATCH", "DELETE"],
      params: (w: World) => ({ scenarioId: w.b.scenarioId }),
      body: { name: "x" },
    },
    {
      route: "/api/suites/[suiteId]",
      methods: ["GET", "PATCH", "DELETE"],
      params: (w: World) => ({ suiteId: w.b.suiteId }),
      body: { name: "x" },
    },
    { route: "/api/runs/[runId]", methods: ["GET"], params: (w: World) => ({ runId: w.b.runId }) },
    {
      route: "/api/benches/[benchId]/export",
      methods: ["GET"],
      params: (w: World) => ({ benchId: w.b.benchId }),
    },
    {
      route: "/api/benches/[benchId]/import",
      methods: ["POST"],
      params: (w: World) => ({ benchId: w.b.benchId }),
      body: { kind: "bench", fileName: "x.bench.json", document: benchDocument("x") },
    },
    {
      route: "/api/benches/[benchId]/floor-plan",
      methods: ["GET", "PUT", "DELETE"],
      params: (w: World) => ({ benchId: w.b.floorPlanBenchId }),
      rawBody: { contentType: "image/svg+xml", text: floorPlanSvg },
    },
    {
      route: "/api/runs/[runId]/events",
      methods: ["GET"],
      params: (w: World) => ({ runId: w.b.runId }),
    },
    {
      route: "/api/runs/[runId]/share",
      methods: ["POST"],
      params: (w: World) => ({ runId: w.b.runId }),
      body: { to: "engineer@a.example" },
    },
    {
      route: "/api/labs/[labId]/assignments",
      methods: ["POST"],
      params: (w: World) => ({ labId: w.b.labId }),
      body: { apprenticeIds: ["x"] },
    },
    // Only the assigned apprentice may open or submit, so A's apprentice asks for B's.
    {
      route: "/api/labs/assignments/[assignmentId]/open",
      methods: ["POST"],
      params: (w: World) => ({ assignmentId: w.b.assignmentId }),
      as: "apprentice",
    },
    {
      route: "/api/labs/assignments/[assignmentId]/submit",
      methods: ["POST"],
      params: (w: World) => ({ assignmentId: w.b.assignmentId }),
      as: "apprentice",
    },
  ] as const;

  for (const crossCase of crossCases) {
    const role: Role = "as" in crossCase ? crossCase.as : "admin";
    for (const method of crossCase.methods) {
      it(`an ${role} of A gets 404 for ${method} ${crossCase.route} with B's id`, async () => {
        const handlers = (await import(
          /* @vite-ignore */ `@/app${crossCase.route}/route`
        )) as Record<string, unknown>;
        const params = crossCase.params(world);
        const sendsBody = method !== "GET" && method !== "DELETE";
        const response = await call(handlers[method], {
          method,
          path: pathOf(crossCase.route, params),
          params,
          cookie: await cookieFor(world.users[role].userId, world.a.workspaceId),
          ...("body" in crossCase && sendsBody ? { body: crossCase.body } : {}),
          ...("rawBody" in crossCase && sendsBody
            ? {
                rawBody: crossCase.rawBody.text,
                headers: { "content-type": crossCase.rawBody.contentType },
              }
            : {}),
        });
        expect(response.status, await response.clone().text()).toBe(404);
      });
    }
  }

  it("refuses B's scenario, suite and bench revision in bodies with 404", async () => {
    const cookie = await cookieFor(world.users.admin.userId, world.a.workspaceId);
    const runs = await import("@/app/api/runs/route");
    for (const body of [
      { scenarioId: world.b.scenarioId },
      { suiteId: world.b.suiteId },
      { scenarioId: world.a.scenarioId, benchRevisionId: world.b.revisionId },
    ]) {
      const response = await call(runs.POST, { method: "POST", path: "/api/runs", cookie, body });
      expect(response.status, JSON.stringify(body)).toBe(404);
    }
    const suites = await import("@/app/api/suites/route");
    const suite = await call(suites.POST, {
      method: "POST",
      path: "/api/suites",
      cookie,
      body: { name: "Mixed", scenarioIds: [world.a.scenarioId, world.b.scenarioId] },
    });
    expect(suite.status).toBe(404);
    expect(((await suite.json()) as { error: { field: string } }).error.field).toBe(
      "scenarioIds[1]",
    );
    const labs = await import("@/app/api/labs/route");
    for (const body of [
      { title: "Foreign bench", benchId: world.b.benchId, gradingScenarioId: world.a.scenarioId },
      {
        title: "Foreign scenario",
        benchId: world.a.benchId,
        gradingScenarioId: world.b.scenarioId,
      },
    ]) {
      const response = await call(labs.POST, { method: "POST", path: "/api/labs", cookie, body });
      expect(response.status, JSON.stringify(body)).toBe(404);
    }
  });

  it("does not list B's labs to A's trainer nor B's assignments to A's apprentice", async () => {
    const { GET } = await import("@/app/api/labs/route");
    const trainer = (await (
      await call(GET, {
        method: "GET",
        path: "/api/labs",
        cookie: await cookieFor(world.users.trainer.userId, world.a.workspaceId),
      })
    ).json()) as { labs: { id: string }[] };
    expect(trainer.labs.map((lab) => lab.id)).toContain(world.a.labId);
    expect(trainer.labs.map((lab) => lab.id)).not.toContain(world.b.labId);
    const apprentice = (await (
      await call(GET, {
        method: "GET",
        path: "/api/labs",
        cookie: await cookieFor(world.users.apprentice.userId, world.a.workspaceId),
      })
    ).json()) as { assignments: { id: string }[] };
    expect(apprentice.assignments.map((a) => a.id)).toContain(world.a.assignmentId);
    expect(apprentice.assignments.map((a) => a.id)).not.toContain(world.b.assignmentId);
  });

  it("does not list B's benches, scenarios, suites or runs to A", async () => {
    const cookie = await cookieFor(world.users.admin.userId, world.a.workspaceId);
    const lists = [
      ["/api/benches", "benches", world.b.benchId],
      ["/api/scenarios", "scenarios", world.b.scenarioId],
      ["/api/suites", "suites", world.b.suiteId],
      ["/api/runs", "runs", world.b.runId],
    ] as const;
    for (const [route, key, foreignId] of lists) {
      const handlers = (await import(/* @vite-ignore */ `@/app${route}/route`)) as Record<
        string,
        unknown
      >;
      const body = (await (
        await call(handlers.GET, { method: "GET", path: route, cookie })
      ).json()) as Record<string, { id: string }[]>;
      expect(body[key]!.map((item) => item.id)).not.toContain(foreignId);
    }
  });
});

/** Every schema.ts under app/api. */
function schemaFiles(dir = "app/api"): string[] {
  const out: string[] = [];
  for (const entry of readdirSync(dir)) {
    const full = path.join(dir, entry);
    if (statSync(full).isDirectory()) out.push(...schemaFiles(full));
    else if (entry === "schema.ts") out.push(full);
  }
  return out;
}

describe("every id a body or query names goes through the same visibility rule as a direct read", () => {
  it("covers every id-carrying field of every body and query schema", async () => {
    const covered = new Set(bodyIdCases.map((c) => `${c.schema}#${c.key}`));
    const missing: string[] = [];
    for (const file of schemaFiles()) {
      const mod = (await import(/* @vite-ignore */ path.resolve(file))) as Record<string, unknown>;
      for (const value of Object.values(mod)) {
        const shape = (value as { shape?: Record<string, unknown> } | null)?.shape;
        if (!shape) continue;
        for (const key of Object.keys(shape)) {
          if (/Ids?$/.test(key) && !covered.has(`${file}#${key}`)) missing.push(`${file}#${key}`);
        }
      }
    }
    expect(missing).toEqual([]);
  });

  for (const idCase of bodyIdCases) {
    const kinds = idCase.private ? (["foreign", "private"] as const) : (["foreign"] as const);
    for (const kind of kinds) {
      it(`${idCase.as} ${idCase.method} ${idCase.route} naming ${kind === "foreign" ? "B's" : "another member's private"} ${idCase.field} -> 404/400 naming the field, nothing changed`, async () => {
        const handlers = await idCase.load();
        const id = kind === "foreign" ? idCase.foreign(world) : idCase.private!(world);
        const params = idCase.params?.(world) ?? {};
        const cookie = await cookieFor(world.users[idCase.as].userId, world.a.workspaceId);
        const before = databaseSnapshot();
        const response = await call(handlers[idCase.method], {
          method: idCase.method,
          path: `${pathOf(idCase.route, params)}${idCase.query ? idCase.query(id) : ""}`,
          params,
          cookie,
          ...(idCase.body ? { body: idCase.body(world, id) } : {}),
        });
        const text = await response.text();
        expect([400, 404], text).toContain(response.status);
        expect((JSON.parse(text) as { error: { field?: string } }).error.field, text).toBe(
          idCase.field,
        );
        for (const name of secretNames) expect(text).not.toContain(name);
        expect(databaseSnapshot()).toBe(before);
      });
    }
  }
});
