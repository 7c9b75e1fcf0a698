import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  appOrigin,
  cookieFor,
  createWorld,
  databaseSnapshot,
  destroyWorld,
  type World,
} from "./support/world";

/**
 * PUT/GET/DELETE /api/benches/:benchId/floor-plan: the image is the raw body,
 * stored on the bench (uploads.benchId, purpose "floor-plan"), one per bench.
 */

// PNG spec §5.2: every PNG file starts with these eight bytes.
const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
const png = new Uint8Array([...PNG_SIGNATURE, 0, 0, 0, 0]);

type Handler = (
  request: Request,
  context: { params: Promise<Record<string, string>> },
) => Promise<Response>;

let world: World;
let route: Record<"GET" | "PUT" | "DELETE", Handler>;
beforeAll(async () => {
  world = createWorld();
  route = (await import("@/app/api/benches/[benchId]/floor-plan/route")) as unknown as typeof route;
});
afterAll(() => destroyWorld(world));

async function send(
  method: "GET" | "PUT" | "DELETE",
  options: {
    benchId: string;
    cookie: string;
    type?: string;
    body?: Uint8Array<ArrayBuffer> | string;
  },
) {
  const headers = new Headers({ cookie: options.cookie });
  if (method !== "GET") headers.set("origin", appOrigin);
  if (options.type) headers.set("content-type", options.type);
  const request = new Request(`${appOrigin}/api/benches/${options.benchId}/floor-plan`, {
    method,
    headers,
    ...(options.body === undefined ? {} : { body: options.body }),
  });
  return route[method](request, { params: Promise.resolve({ benchId: options.benchId }) });
}

describe("floor plans", () => {
  it("stores a PNG on the bench, serves it back, and replaces it with the next upload", async () => {
    const cookie = await cookieFor(world.users.engineer.userId, world.a.workspaceId);
    const put = await send("PUT", {
      benchId: world.a.benchId,
      cookie,
      type: "image/png",
      body: png,
    });
    expect(put.status).toBe(201);
    const { floorPlan } = (await put.json()) as { floorPlan: { url: string; removed: string[] } };
    expect(floorPlan.url).toMatch(new RegExp(`^/api/benches/${world.a.benchId}/floor-plan\\?v=`));

    const get = await send("GET", { benchId: world.a.benchId, cookie });
    expect(get.status).toBe(200);
    expect(get.headers.get("content-type")).toBe("image/png");
    expect(new Uint8Array(await get.arrayBuffer())).toEqual(png);

    const svg = '<svg xmlns="http://www.w3.org/2000/svg"><script>alert(1)</script><rect/></svg>';
    const second = await send("PUT", {
      benchId: world.a.benchId,
      cookie,
      type: "image/svg+xml",
      body: svg,
    });
    expect(second.status).toBe(201);
    const served = await send("GET", { benchId: world.a.benchId, cookie });
    expect(served.headers.get("content-type")).toBe("image/svg+xml");
    expect(await served.text()).not.toContain("script");
  });

  it("answers 404 for a bench of another workspace and changes nothing", async () => {
    const outsider = await cookieFor(world.outsider.userId, world.b.workspaceId);
    const before = databaseSnapshot();
    expect((await send("GET", { benchId: world.a.benchId, cookie: outsider })).status).toBe(404);
    const put = await send("PUT", {
      benchId: world.a.benchId,
      cookie: outsider,
      type: "image/png",
      body: png,
    });
    expect(put.status).toBe(404);
    expect((await send("DELETE", { benchId: world.a.benchId, cookie: outsider })).status).toBe(404);
    expect(databaseSnapshot()).toBe(before);
  });

  it("refuses a type it does not take and bytes that are not the declared image, naming the file", async () => {
    const cookie = await cookieFor(world.users.engineer.userId, world.a.workspaceId);
    const before = databaseSnapshot();
    const gif = await send("PUT", {
      benchId: world.a.benchId,
      cookie,
      type: "image/gif",
      body: png,
    });
    expect(gif.status).toBe(415);
    expect(((await gif.json()) as { error: { field: string } }).error.field).toBe("file");
    const notPng = await send("PUT", {
      benchId: world.a.benchId,
      cookie,
      type: "image/png",
      body: "not an image",
    });
    expect(notPng.status).toBe(400);
    expect(((await notPng.json()) as { error: { field: string } }).error.field).toBe("file");
    expect(databaseSnapshot()).toBe(before);
  });

  it("lets only editors upload or remove (qa reads), and removing leaves 404", async () => {
    const qa = await cookieFor(world.users.qa.userId, world.a.workspaceId);
    expect((await send("GET", { benchId: world.a.benchId, cookie: qa })).status).toBe(200);
    expect(
      (await send("PUT", { benchId: world.a.benchId, cookie: qa, type: "image/png", body: png }))
        .status,
    ).toBe(403);
    expect((await send("DELETE", { benchId: world.a.benchId, cookie: qa })).status).toBe(403);

    const engineer = await cookieFor(world.users.engineer.userId, world.a.workspaceId);
    expect((await send("DELETE", { benchId: world.a.benchId, cookie: engineer })).status).toBe(204);
    expect((await send("GET", { benchId: world.a.benchId, cookie: engineer })).status).toBe(404);
  });
});
