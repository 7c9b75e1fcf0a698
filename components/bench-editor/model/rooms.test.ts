import { describe, expect, it } from "vitest";
import { loadBench, type Bench } from "@/engine";
import { addRoom, deleteRoom, freshRoomId, renameRoom, setRoomThermal } from "./rooms";
import { testBench } from "./test-bench";

function benchWithRooms(): Bench {
  const bench = testBench();
  return {
    ...bench,
    rooms: [
      { id: "room-1", name: "Hall" },
      { id: "room-3", name: "Office", outdoorC: 2 },
    ],
    devices: bench.devices.map((d) => ({ ...d, room: "room-1" })),
  };
}

describe("room edits", () => {
  it("gives a new room the lowest free id", () => {
    expect(freshRoomId(benchWithRooms())).toBe("room-2");
    const added = addRoom(benchWithRooms(), "Store");
    expect(added.ok && added.value.roomId).toBe("room-2");
  });

  it("refuses values the engine's bench schema refuses, naming the field", () => {
    const bench = benchWithRooms();
    const outcome = setRoomThermal(bench, "room-3", "envelopeUaWPerK", 0);
    expect(outcome.ok).toBe(false);
    if (!outcome.ok)
      expect(outcome.error).toMatchObject({ kind: "edit.room-invalid", field: "envelopeUaWPerK" });
    expect(setRoomThermal(bench, "nowhere", "outdoorC", 1).ok).toBe(false);
    expect(renameRoom(bench, "room-3", "").ok).toBe(false);
  });

  it("deletes one room, moving only its devices out, and keeps the bench loadable", () => {
    const outcome = deleteRoom(benchWithRooms(), "room-1");
    if (!outcome.ok) throw new Error(outcome.error.message);
    expect(outcome.value.movedOut).toBe(benchWithRooms().devices.length);
    expect(outcome.value.bench.rooms?.map((r) => r.id)).toEqual(["room-3"]);
    expect(outcome.value.bench.devices.some((d) => "room" in d)).toBe(false);
    expect(loadBench(outcome.value.bench).ok).toBe(true);
  });
});
