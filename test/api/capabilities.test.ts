import { readdirSync, statSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { can, capabilities, capabilityTable } from "@/app/_lib/capabilities";
import { roles } from "@/db/schema";
import { guardedRoutes, pathOf, publicRoutes, sessionOnlyRoutes } from "./support/routes";
import { call, cookieFor, createWorld, destroyWorld, type World } from "./support/world";

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

/**
 * The route folders this matrix answers for. Routes the app contract gives to
 * other engineers (bench import/export/floor plan, run execution and streaming,
 * labs) are matrix-tested by their owners; add them to guardedRoutes to have
 * them checked here too.
 */
function coveredHere(route: string): boolean {
  if (/^\/api\/benches\/\[benchId\]\/(import|export|floor-plan)(\/|$)/.test(route)) return false;
  if (/^\/api\/runs\/(start|\[runId\]\/.)/.test(route)) return false;
  return /^\/api\/(members|invitations|benches|scenarios|suites|runs|session|health)(\/|$)/.test(
    route,
  );
}

let world: World;
beforeAll(() => {
  world = createWorld();
});
afterAll(() => destroyWorld(world));

describe("the route list covers every route handler", () => {
  it("lists every exported method of every route.ts (so none escapes the matrix)", async () => {
    const known = new Set(
      [...guardedRoutes, ...publicRoutes, ...sessionOnlyRoutes].map(
        (r) => `${r.method} ${r.route}`,
      ),
    );
    const missing: string[] = [];
    for (const route of routeFiles()) {
      if (!coveredHere(route)) continue;
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

describe("each role can do exactly what the capability table allows", () => {
  for (const route of guardedRoutes) {
    for (const role of roles) {
      const scope = capabilityTable[route.capability][role];
      const allowed =
        route.reach === "any"
          ? can(role, route.capability)
          : can(role, route.capability, { scope: "workspace" });
      it(`${role} ${route.method} ${route.route} (${route.capability}: ${scope}) -> ${allowed ? "allowed" : "403"}`, async () => {
        const handlers = await route.load();
        const params = route.params?.(world) ?? {};
        const response = await call(handlers[route.method], {
          method: route.method,
          path: pathOf(route.route, params),
          params,
          cookie: await cookieFor(world.users[role].userId, world.a.workspaceId),
          ...(route.body ? { body: route.body(world) } : {}),
        });
        if (allowed) {
          expect(response.status, await response.clone().text()).toBeLessThan(300);
        } else {
          expect(response.status).toBe(403);
          const body = (await response.json()) as { error: { code: string; message: string } };
          expect(body.error.code).toBe("forbidden");
        }
      });
    }
  }

  it("answers 401 on every guarded route without a session", async () => {
    for (const route of [...guardedRoutes]) {
      const handlers = await route.load();
      const params = route.params?.(world) ?? {};
      const response = await call(handlers[route.method], {
        method: route.method,
        path: pathOf(route.route, params),
        params,
        ...(route.body ? { body: route.body(world) } : {}),
      });
      expect(response.status, `${route.method} ${route.route}`).toBe(401);
    }
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
  ] as const;

  for (const crossCase of crossCases) {
    for (const method of crossCase.methods) {
      it(`an admin of A gets 404 for ${method} ${crossCase.route} with B's id`, async () => {
        const handlers = (await import(
          /* @vite-ignore */ `@/app${crossCase.route}/route`
        )) as Record<string, unknown>;
        const params = crossCase.params(world);
        const response = await call(handlers[method], {
          method,
          path: pathOf(crossCase.route, params),
          params,
          cookie: await cookieFor(world.users.admin.userId, world.a.workspaceId),
          ...("body" in crossCase && method !== "GET" && method !== "DELETE"
            ? { body: crossCase.body }
            : {}),
        });
        expect(response.status).toBe(404);
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
