import { benchRoomSchema, ok } from "@/engine";
import type { Bench, BenchDevice, BenchRoom } from "@/engine";
import { refuse, type EditResult } from "./edit-refusal";

/** The thermal figures of a room a person may set; each left out takes the engine's default. */
export type RoomThermalField = "initialC" | "outdoorC" | "heatCapacityKJPerK" | "envelopeUaWPerK";

/** A fresh room id "room-<n>" no room on the bench uses yet. */
export function freshRoomId(bench: Bench): string {
  const taken = new Set((bench.rooms ?? []).map((r) => r.id));
  for (let n = 1; ; n++) {
    const id = `room-${n}`;
    if (!taken.has(id)) return id;
  }
}

/** Adds a room with the engine's default physics; devices join it from their own panel. */
export function addRoom(bench: Bench, name?: string): EditResult<{ bench: Bench; roomId: string }> {
  const rooms = bench.rooms ?? [];
  const id = freshRoomId(bench);
  const trimmed = (name ?? `Room ${rooms.length + 1}`).trim();
  if (trimmed === "") return refuse("edit.name-empty", "a room needs a name", "name");
  return ok({ bench: { ...bench, rooms: [...rooms, { id, name: trimmed }] }, roomId: id });
}

/** Replaces one room after checking it against the bench schema, so the editor never holds a room the server would refuse. */
function replaceRoom(bench: Bench, id: string, next: BenchRoom): EditResult {
  const rooms = bench.rooms ?? [];
  if (!rooms.some((r) => r.id === id))
    return refuse("edit.room-unknown", `no room "${id}" on this bench`, "room");
  const parsed = benchRoomSchema.safeParse(next);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    const field = issue.path.map(String).join(".") || "room";
    return refuse("edit.room-invalid", issue.message, field);
  }
  return ok({ ...bench, rooms: rooms.map((r) => (r.id === id ? parsed.data : r)) });
}

export function renameRoom(bench: Bench, id: string, name: string): EditResult {
  const room = (bench.rooms ?? []).find((r) => r.id === id);
  if (name.trim() === "") return refuse("edit.name-empty", "a room needs a name", "name");
  return replaceRoom(bench, id, { ...(room ?? { id, name }), name: name.trim() });
}

/**
 * Sets one thermal figure of a room, or with undefined leaves it to the
 * engine's default. A value outside the schema's range (a heat capacity of 0
 * or less, say) is refused with the schema's message naming range and unit.
 */
export function setRoomThermal(
  bench: Bench,
  id: string,
  field: RoomThermalField,
  value: number | undefined,
): EditResult {
  const room = (bench.rooms ?? []).find((r) => r.id === id);
  if (room === undefined)
    return refuse("edit.room-unknown", `no room "${id}" on this bench`, "room");
  const next: BenchRoom = { ...room, [field]: value };
  if (value === undefined) delete next[field];
  return replaceRoom(bench, id, next);
}

/** The devices that name a room, in bench order. */
export function devicesInRoom(bench: Bench, id: string): BenchDevice[] {
  return bench.devices.filter((d) => d.room === id);
}

/**
 * Removes a room. Devices in it are not refused but moved out (their `room`
 * cleared): each then models a room of its own again, as on a bench without
 * rooms, and undo brings the room and its devices back in one step. Refusing
 * instead would send a person through every device panel to delete one room.
 */
export function deleteRoom(
  bench: Bench,
  id: string,
): EditResult<{ bench: Bench; movedOut: number }> {
  const rooms = bench.rooms ?? [];
  if (!rooms.some((r) => r.id === id))
    return refuse("edit.room-unknown", `no room "${id}" on this bench`, "room");
  let movedOut = 0;
  const devices = bench.devices.map((d) => {
    if (d.room !== id) return d;
    movedOut++;
    const next: BenchDevice = { ...d };
    delete next.room;
    return next;
  });
  const left = rooms.filter((r) => r.id !== id);
  const next: Bench = { ...bench, devices, rooms: left };
  // A bench without rooms says nothing about them, as before rooms existed.
  if (left.length === 0) delete next.rooms;
  return ok({ bench: next, movedOut });
}
