import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  benchDocument,
  call,
  cookieFor,
  createWorld,
  destroyWorld,
  type World,
} from "./support/world";

/**
 * The editor's revision history: GET /revisions says who saved each revision,
 * when and what changed; restoring an earlier one is a save of its document,
 * so the history only ever grows.
 */

interface HistoryBody {
  revisions: { number: number; authorName: string | null; summary: string; createdAt: string }[];
}

let world: World;
beforeAll(() => {
  world = createWorld();
});
afterAll(() => destroyWorld(world));

describe("revision history", () => {
  it("lists who saved each revision, newest first, and restores one as a new revision", async () => {
    const bench = await import("@/app/api/benches/[benchId]/route");
    const history = await import("@/app/api/benches/[benchId]/revisions/route");
    const one = await import("@/app/api/benches/[benchId]/revisions/[number]/route");
    const params = { benchId: world.a.benchId };
    const engineer = await cookieFor(world.users.engineer.userId, world.a.workspaceId);

    const saved = await call(bench.PATCH, {
      method: "PATCH",
      path: "/api/x",
      params,
      cookie: engineer,
      body: { document: benchDocument("Renamed bench"), summary: "renamed", baseRevision: 1 },
    });
    expect(saved.status).toBe(200);

    const list = (await (
      await call(history.GET, { method: "GET", path: "/api/x", params, cookie: engineer })
    ).json()) as HistoryBody;
    expect(list.revisions.map((r) => [r.number, r.authorName, r.summary])).toEqual([
      [2, "Sam engineer", "renamed"],
      [1, "Avery Admin", "Created"],
    ]);
    // ISO 8601 instants, as the editor shows them in local time.
    expect(list.revisions[0]!.createdAt).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z$/);

    const first = (await (
      await call(one.GET, {
        method: "GET",
        path: "/api/x",
        params: { ...params, number: "1" },
        cookie: engineer,
      })
    ).json()) as { revision: { document: { name: string } } };
    expect(first.revision.document.name).toBe("Test bench");

    const restored = await call(bench.PATCH, {
      method: "PATCH",
      path: "/api/x",
      params,
      cookie: engineer,
      body: { document: first.revision.document, summary: "Restored revision 1", baseRevision: 2 },
    });
    expect(((await restored.json()) as { revision: { number: number } }).revision.number).toBe(3);
    const after = (await (
      await call(history.GET, { method: "GET", path: "/api/x", params, cookie: engineer })
    ).json()) as HistoryBody;
    expect(after.revisions.map((r) => [r.number, r.summary])).toEqual([
      [3, "Restored revision 1"],
      [2, "renamed"],
      [1, "Created"],
    ]);
  });

  it("is 404 for another workspace's bench", async () => {
    const history = await import("@/app/api/benches/[benchId]/revisions/route");
    const outsider = await cookieFor(world.outsider.userId, world.b.workspaceId);
    const response = await call(history.GET, {
      method: "GET",
      path: "/api/x",
      params: { benchId: world.a.benchId },
      cookie: outsider,
    });
    expect(response.status).toBe(404);
  });
});
