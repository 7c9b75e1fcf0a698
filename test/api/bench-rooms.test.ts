import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  benchDocument,
  call,
  cookieFor,
  createWorld,
  databaseSnapshot,
  destroyWorld,
  type World,
} from "./support/world";

/**
 * Saving a bench with rooms (the editor's save path, PATCH /api/benches/:id
 * with a document): a room the engine's loader refuses is a 400 naming the
 * field inside the document, and the stored bench and its history stay exactly
 * as they were. A good one is stored as a new revision, rooms and all.
 */

interface ErrorBody {
  error: { code: string; message: string; field?: string };
}

let world: World;
let engineer = "";
beforeAll(async () => {
  world = createWorld();
  engineer = await cookieFor(world.users.engineer.userId, world.a.workspaceId);
});
afterAll(() => destroyWorld(world));

type Document = ReturnType<typeof benchDocument> & {
  rooms?: Record<string, unknown>[];
  devices: (ReturnType<typeof benchDocument>["devices"][number] & { room?: string })[];
};

function withRooms(edit: (document: Document) => void): Document {
  const document = benchDocument("Bench with a lab room") as Document;
  document.rooms = [{ id: "lab", name: "Lab", heatCapacityKJPerK: 800, outdoorC: -5 }];
  document.devices[0]!.room = "lab";
  edit(document);
  return document;
}

async function save(document: unknown) {
  const { PATCH } = await import("@/app/api/benches/[benchId]/route");
  return call(PATCH, {
    method: "PATCH",
    path: "/api/x",
    params: { benchId: world.a.benchId },
    cookie: engineer,
    body: { document, summary: "rooms" },
  });
}

async function storedDocument() {
  const { GET } = await import("@/app/api/benches/[benchId]/route");
  const response = await call(GET, {
    method: "GET",
    path: "/api/x",
    params: { benchId: world.a.benchId },
    cookie: engineer,
  });
  return ((await response.json()) as { revision: { number: number; document: Document } }).revision;
}

describe("saving a bench with rooms", () => {
  it.each([
    [
      "a device in a room the bench does not declare",
      (d: Document) => (d.devices[0]!.room = "kitchen"),
      "document.devices[0].room",
      /no room "kitchen"/,
    ],
    [
      "two rooms with one id",
      (d: Document) => d.rooms!.push({ id: "lab", name: "Lab again" }),
      "document.rooms[1].id",
      /used twice/,
    ],
    [
      "a negative heat capacity",
      (d: Document) => (d.rooms![0]!.heatCapacityKJPerK = -600),
      "document.rooms[0].heatCapacityKJPerK",
      /heat capacity is 10 to 100000 kJ\/K/,
    ],
    [
      "a heat capacity that is not a number",
      (d: Document) => ((d.rooms![0] as Record<string, unknown>).heatCapacityKJPerK = "600"),
      "document.rooms[0].heatCapacityKJPerK",
      /number in kJ\/K/,
    ],
    [
      "a room with a blank name",
      (d: Document) => (d.rooms![0]!.name = "  "),
      "document.rooms[0].name",
      /a room needs a name/,
    ],
    [
      "a room id that is not an id",
      (d: Document) => (d.rooms![0]!.id = "Lab Room"),
      "document.rooms[0].id",
      /lower-case/,
    ],
  ])(
    "refuses %s with 400 naming the field, and stores nothing",
    async (_, edit, field, message) => {
      const before = databaseSnapshot();
      const revisionBefore = await storedDocument();
      const response = await save(withRooms(edit));
      expect(response.status).toBe(400);
      const error = ((await response.json()) as ErrorBody).error;
      expect(error.field).toBe(field);
      expect(error.message).toMatch(message);
      expect(databaseSnapshot()).toBe(before);
      expect(await storedDocument()).toEqual(revisionBefore);
    },
  );

  it("stores a good one as a new revision that reads back with its rooms", async () => {
    const before = await storedDocument();
    const response = await save(withRooms(() => {}));
    expect(response.status).toBe(200);
    const after = await storedDocument();
    expect(after.number).toBe(before.number + 1);
    expect(after.document.rooms).toEqual([
      { id: "lab", name: "Lab", heatCapacityKJPerK: 800, outdoorC: -5 },
    ]);
    expect(after.document.devices[0]!.room).toBe("lab");
  });
});
