import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { scopeOf } from "@/app/_lib/capabilities";
import { maxJsonDepth } from "@/app/_lib/json-shape";
import { roles } from "@/db/schema";
import { guardedRoutes, sessionOnlyRoutes } from "./support/routes";
import {
  appOrigin,
  cookieFor,
  createWorld,
  databaseSnapshot,
  destroyWorld,
  scenarioDocument,
  type World,
} from "./support/world";

/**
 * How request bodies are read: never before the session and the role are
 * checked, always through one reader that stops at the route's limit (also
 * for chunked bodies without Content-Length), with a bound on JSON nesting
 * and UTF-8 as the only charset.
 */

type Handler = (
  request: Request,
  context: { params: Promise<Record<string, string>> },
) => Promise<Response>;

const noParams = { params: Promise.resolve({}) };

interface ErrorBody {
  error: { code: string; message: string; field?: string };
}

let world: World;
beforeAll(() => {
  world = createWorld();
});
afterAll(() => destroyWorld(world));

/**
 * A chunked body (no Content-Length) that counts what the server pulls from
 * it: 48 chunks, more than any route's limit. (Bounded so that a server that
 * does read it all, as before the fix, ends the test instead of looping.)
 */
function countingBody(chunkBytes: number, fill = 0x20, chunks = 48) {
  const counter = { pulls: 0, bytes: 0 };
  // highWaterMark 0: the stream produces a chunk only when the reader asks.
  const stream = new ReadableStream<Uint8Array>(
    {
      pull(controller) {
        if (counter.pulls === chunks) {
          controller.close();
          return;
        }
        counter.pulls += 1;
        counter.bytes += chunkBytes;
        controller.enqueue(new Uint8Array(chunkBytes).fill(fill));
      },
    },
    { highWaterMark: 0 },
  );
  return { stream, counter };
}

function streamingRequest(
  method: string,
  body: ReadableStream<Uint8Array>,
  headers: Record<string, string>,
): Request {
  return new Request(`${appOrigin}/api/x`, {
    method,
    headers: { origin: appOrigin, ...headers },
    body,
    duplex: "half",
  } as RequestInit);
}

const bodyRoutes = guardedRoutes.filter((r) => r.body !== undefined || r.rawBody !== undefined);

function contentTypeOf(r: (typeof bodyRoutes)[number]) {
  return r.rawBody ? r.rawBody().contentType : "application/json";
}

describe("no body is read before the session and the role are checked (defect 4)", () => {
  it.each(bodyRoutes.map((r) => [`${r.method} ${r.route}`, r] as const))(
    "%s without a session: 401, and not one chunk pulled",
    async (_name, r) => {
      const handler = (await r.load())[r.method] as Handler;
      const { stream, counter } = countingBody(64 * 1024);
      const params = r.params?.(world) ?? {};
      const before = databaseSnapshot();
      const response = await handler(
        streamingRequest(r.method, stream, { "content-type": contentTypeOf(r) }),
        { params: Promise.resolve(params) },
      );
      expect(response.status).toBe(401);
      expect(counter.pulls).toBe(0);
      expect(databaseSnapshot() === before).toBe(true);
    },
  );

  it.each(sessionOnlyRoutes.filter((r) => r.method === "PATCH").map((r) => [r.route] as const))(
    "PATCH %s without a session: 401, and not one chunk pulled",
    async () => {
      const { PATCH } = await import("@/app/api/session/route");
      const { stream, counter } = countingBody(64 * 1024);
      const response = await PATCH(
        streamingRequest("PATCH", stream, { "content-type": "application/json" }),
        noParams,
      );
      expect(response.status).toBe(401);
      expect(counter.pulls).toBe(0);
    },
  );

  // Whether an import needs benches.edit or scenarios.edit depends on the
  // file's kind, which is in the body; no role lacks both.
  const roleCases = bodyRoutes
    .filter((r) => r.route !== "/api/benches/[benchId]/import")
    .flatMap((r) =>
      roles
        .filter((role) => scopeOf(role, r.capability) === "none")
        .map((role) => [`${r.method} ${r.route} as ${role}`, r, role] as const),
    );

  it.each(roleCases)("%s: 403, and not one chunk pulled", async (_name, r, role) => {
    const handler = (await r.load())[r.method] as Handler;
    const { stream, counter } = countingBody(64 * 1024);
    const cookie = await cookieFor(world.users[role].userId, world.a.workspaceId);
    const response = await handler(
      streamingRequest(r.method, stream, { "content-type": contentTypeOf(r), cookie }),
      { params: Promise.resolve(r.params?.(world) ?? {}) },
    );
    expect(response.status).toBe(403);
    expect(counter.pulls).toBe(0);
  });
});

describe("one size-limited reader stops at the route's limit, chunked or not (defect 4)", () => {
  const floorPlanLimit = 2 * 1024 * 1024;
  const chunk = 64 * 1024;

  it("an engineer's 3 MiB chunked floor plan: 413 after at most the limit and one chunk", async () => {
    const { PUT } = await import("@/app/api/benches/[benchId]/floor-plan/route");
    const { stream, counter } = countingBody(chunk);
    const cookie = await cookieFor(world.users.engineer.userId, world.a.workspaceId);
    const before = databaseSnapshot();
    const response = await PUT(
      streamingRequest("PUT", stream, { "content-type": "image/svg+xml", cookie }),
      {
        params: Promise.resolve({ benchId: world.a.floorPlanBenchId }),
      },
    );
    expect(response.status).toBe(413);
    const error = ((await response.json()) as ErrorBody).error;
    expect(error).toMatchObject({ code: "body_too_large", field: "file" });
    expect(error.message).toMatch(/at most 2 MiB/);
    expect(counter.bytes).toBeLessThanOrEqual(floorPlanLimit + chunk);
    expect(databaseSnapshot() === before).toBe(true);
  });

  it("a 3 MiB chunked JSON body: 413 after at most the limit and one chunk", async () => {
    const { POST } = await import("@/app/api/suites/route");
    const { stream, counter } = countingBody(chunk);
    const cookie = await cookieFor(world.users.admin.userId, world.a.workspaceId);
    const response = await POST(
      streamingRequest("POST", stream, { "content-type": "application/json", cookie }),
      noParams,
    );
    expect(response.status).toBe(413);
    expect(counter.bytes).toBeLessThanOrEqual(64 * 1024 + chunk);
  });
});

/** `[[[...value...]]]` nested `levels` deep. */
function nested(levels: number, inner: unknown = 1): string {
  return `${"[".repeat(levels)}${JSON.stringify(inner)}${"]".repeat(levels)}`;
}

describe("JSON nested deeper than 64 levels is refused with 400 naming the field (defect 6)", () => {
  it("2,000 levels in a scenario step's value", async () => {
    const { POST } = await import("@/app/api/scenarios/route");
    const cookie = await cookieFor(world.users.admin.userId, world.a.workspaceId);
    const document = scenarioDocument();
    const text = JSON.stringify({
      benchId: world.a.benchId,
      document: { ...document, steps: [{ ...document.steps[0], value: "@@" }] },
    }).replace('"@@"', nested(2000));
    const before = databaseSnapshot();
    const response = await POST(
      new Request(`${appOrigin}/api/scenarios`, {
        method: "POST",
        headers: { origin: appOrigin, cookie, "content-type": "application/json" },
        body: text,
      }),
      noParams,
    );
    expect(response.status).toBe(400);
    const error = ((await response.json()) as ErrorBody).error;
    expect(error.field).toBe("document.steps[0].value");
    expect(error.message).toContain(`nested deeper than ${maxJsonDepth} levels`);
    expect(databaseSnapshot() === before).toBe(true);
  });

  it("2,000 levels in a lab's hidden fault value", async () => {
    const { POST } = await import("@/app/api/labs/route");
    const cookie = await cookieFor(world.users.trainer.userId, world.a.workspaceId);
    const text = JSON.stringify({
      title: "Deep",
      benchId: world.a.benchId,
      gradingScenarioId: world.a.scenarioId,
      hiddenFaults: [{ kind: "set-parameter", device: "act", parameter: "p", value: "@@" }],
    }).replace('"@@"', nested(2000, { a: 1 }));
    const before = databaseSnapshot();
    const response = await POST(
      new Request(`${appOrigin}/api/labs`, {
        method: "POST",
        headers: { origin: appOrigin, cookie, "content-type": "application/json" },
        body: text,
      }),
      noParams,
    );
    expect(response.status).toBe(400);
    expect(((await response.json()) as ErrorBody).error.field).toBe("hiddenFaults[0].value");
    expect(databaseSnapshot() === before).toBe(true);
  });

  it("64 levels are still read (the bound is not below what it promises)", async () => {
    const { POST } = await import("@/app/api/suites/route");
    const cookie = await cookieFor(world.users.admin.userId, world.a.workspaceId);
    // The body object is level 1, so the description's value may nest 63 more.
    const text = `{"name":"Deep enough","scenarioIds":[],"description":${nested(63, "x")}}`;
    const response = await POST(
      new Request(`${appOrigin}/api/suites`, {
        method: "POST",
        headers: { origin: appOrigin, cookie, "content-type": "application/json" },
        body: text,
      }),
      noParams,
    );
    // Refused by the schema (a description is text), not by the depth bound.
    expect(response.status).toBe(400);
    expect(((await response.json()) as ErrorBody).error.message).not.toMatch(/nested deeper/);
  });
});

describe("a body declared in another charset than UTF-8 is refused (defect 8)", () => {
  it("JSON sent as charset=utf-16: 415, nothing stored", async () => {
    const { POST } = await import("@/app/api/suites/route");
    const cookie = await cookieFor(world.users.admin.userId, world.a.workspaceId);
    const before = databaseSnapshot();
    for (const type of [
      "application/json; charset=utf-16",
      "application/json;charset=UTF-16LE",
      'application/json; charset="iso-8859-1"',
    ]) {
      const response = await POST(
        new Request(`${appOrigin}/api/suites`, {
          method: "POST",
          headers: { origin: appOrigin, cookie, "content-type": type },
          body: JSON.stringify({ name: "Charset", scenarioIds: [world.a.scenarioId] }),
        }),
        noParams,
      );
      expect(response.status).toBe(415);
      expect(((await response.json()) as ErrorBody).error.message).toMatch(/UTF-8/);
    }
    expect(databaseSnapshot() === before).toBe(true);
    const utf8 = await POST(
      new Request(`${appOrigin}/api/suites`, {
        method: "POST",
        headers: { origin: appOrigin, cookie, "content-type": "application/json; charset=UTF-8" },
        body: JSON.stringify({ name: "Charset", scenarioIds: [world.a.scenarioId] }),
      }),
      noParams,
    );
    expect(utf8.status).toBe(201);
  });

  it("an SVG floor plan sent as charset=utf-16: 415 naming the charset", async () => {
    const { PUT } = await import("@/app/api/benches/[benchId]/floor-plan/route");
    const cookie = await cookieFor(world.users.engineer.userId, world.a.workspaceId);
    const before = databaseSnapshot();
    const response = await PUT(
      new Request(`${appOrigin}/api/x`, {
        method: "PUT",
        headers: { origin: appOrigin, cookie, "content-type": "image/svg+xml; charset=utf-16" },
        body: Buffer.from('<svg xmlns="http://www.w3.org/2000/svg"/>', "utf16le"),
      }),
      { params: Promise.resolve({ benchId: world.a.floorPlanBenchId }) },
    );
    expect(response.status).toBe(415);
    expect(((await response.json()) as ErrorBody).error.message).toContain("utf-16");
    expect(databaseSnapshot() === before).toBe(true);
  });
});
