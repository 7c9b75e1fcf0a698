import { describe, expect, it } from "vitest";
import { trainingRoomBench } from "../../../test/harness/training-room-bench";
import type { BenchInput } from "../../bench/bench-schema";
import {
  DEFAULT_OUTDOOR_C,
  DEFAULT_ROOM_HEAT_CAPACITY_J_PER_K,
  DEFAULT_ROOM_UA_W_PER_K,
} from "../../room";
import { LiveSession } from "./live-session";
import {
  parseSimMessage,
  type BenchRoomSample,
  type RoomSample,
  type SimMessage,
} from "./live-protocol";

/**
 * The console's room chart on a bench that declares rooms: one series per
 * room, its air temperature read from the shared room model, with the
 * setpoints of the units in it; a unit in no room keeps its own series.
 */

// The console test room with two declared rooms: the unit and the window contact in "lab",
// nothing but its envelope in "store" (outdoor left to engine/room's default).
const roomsBench: BenchInput = {
  ...trainingRoomBench,
  rooms: [
    { id: "lab", name: "Lab", initialC: 18, outdoorC: 5 },
    { id: "store", name: "Store room", initialC: 15 },
  ],
  devices: (trainingRoomBench.devices ?? []).map((d) =>
    d.id === "unit" || d.id === "window" ? { ...d, room: "lab" } : d,
  ),
};

function run(bench: BenchInput) {
  let wallMs = 0;
  const messages: SimMessage[] = [];
  const session = new LiveSession({ post: (m) => messages.push(m), now: () => wallMs });
  session.handle({ type: "load", bench });
  session.handle({ type: "play", speed: 100 });
  // Power on, heat, 23 °C (gateway objects on 2/0/0, 2/0/4, 2/0/2 of the test bench).
  session.handle({ type: "input", input: { kind: "write", groupAddress: "2/0/0", value: true } });
  session.handle({ type: "input", input: { kind: "write", groupAddress: "2/0/4", value: "heat" } });
  session.handle({ type: "input", input: { kind: "write", groupAddress: "2/0/2", value: 23 } });
  const samples: RoomSample[] = [];
  for (let t = 0; t < 6_000; t += 50) {
    wallMs += 50;
    session.tick();
  }
  for (const message of messages) {
    // Every message still passes the protocol's full schema.
    const parsed = parseSimMessage(message);
    if (parsed.type === "batch") samples.push(...parsed.rooms);
  }
  return { session, samples };
}

function roomSeries(samples: readonly RoomSample[], roomId: string): BenchRoomSample[] {
  return samples.filter((s): s is BenchRoomSample => "roomId" in s && s.roomId === roomId);
}

describe("room chart samples on a bench with rooms", () => {
  it("samples each declared room once, with the units in it, and no unit series for a unit in a room", () => {
    const { session, samples } = run(roomsBench);
    expect(samples.some((s) => "unitId" in s)).toBe(false);
    const lab = roomSeries(samples, "lab");
    const store = roomSeries(samples, "store");
    expect(lab.length).toBeGreaterThan(100);
    expect(store).toHaveLength(lab.length);
    expect(store.every((s) => s.units.length === 0)).toBe(true);
    const last = lab.at(-1)!;
    expect(last.units).toEqual([{ unitId: "unit", setpointC: 23, power: true }]);
    // A sample is the shared room model's value at its time (a late viewer's sample is taken now).
    const sim = session.simulation!;
    const now = session.currentState()[1]!;
    if (now.type !== "batch") throw new Error("no batch");
    expect(roomSeries(now.rooms, "lab")).toEqual([
      { timeUs: sim.nowUs, roomId: "lab", roomC: sim.roomTemperatureC("lab"), units: last.units },
    ]);
    // Heated towards 23 °C, the lab has warmed from its 18 °C start.
    expect(last.roomC).toBeGreaterThan(18);
  });

  it("follows Newton's law of cooling in a room nothing drives", () => {
    // Lumped-capacitance method (any heat-transfer handbook): T(t) = T_out + (T_0 − T_out)·e^(−t/τ),
    // τ = C/UA, here with engine/room's default C and UA and the default outdoor temperature.
    const tauS = DEFAULT_ROOM_HEAT_CAPACITY_J_PER_K / DEFAULT_ROOM_UA_W_PER_K;
    const { samples } = run(roomsBench);
    const store = roomSeries(samples, "store");
    expect(store[0]).toMatchObject({ timeUs: 0, roomC: 15 });
    for (const s of store)
      expect(s.roomC).toBeCloseTo(
        DEFAULT_OUTDOOR_C + (15 - DEFAULT_OUTDOOR_C) * Math.exp(-s.timeUs / 1e6 / tauS),
        9,
      );
  });

  it("keeps a series of its own for a unit in no room, as on a bench without rooms", () => {
    const mixed: BenchInput = {
      ...roomsBench,
      devices: (trainingRoomBench.devices ?? []).map((d) =>
        d.id === "window" ? { ...d, room: "lab" } : d,
      ),
    };
    const { samples } = run(mixed);
    expect(roomSeries(samples, "lab").every((s) => s.units.length === 0)).toBe(true);
    const own = samples.filter((s) => "unitId" in s);
    expect(own.length).toBeGreaterThan(100);
    expect(own.at(-1)).toMatchObject({ unitId: "unit", setpointC: 23, power: true });
    const plain = run(trainingRoomBench).samples;
    expect(plain.every((s) => "unitId" in s)).toBe(true);
  });
});
