import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  NO_DRIVE,
  equilibriumC,
  roomBalance,
  secondsToReach,
  temperatureAfterC,
  timeConstantS,
  type RoomDrive,
  type RoomThermalSpec,
} from "./lumped-room";
import {
  COOLING_SUPPLY_C,
  DEFAULT_ROOM_HEAT_CAPACITY_J_PER_K,
  DEFAULT_ROOM_UA_W_PER_K,
  HEATING_SUPPLY_C,
} from "./room-constants";

const room: RoomThermalSpec = {
  heatCapacityJPerK: DEFAULT_ROOM_HEAT_CAPACITY_J_PER_K,
  envelopeUaWPerK: DEFAULT_ROOM_UA_W_PER_K,
  outdoorC: 5,
};

// Lumped-capacitance method (any heat-transfer handbook, transient conduction):
// C·dT/dt = Q − UA·(T − T_out) with constant Q has T(t) = T_eq + (T_0 − T_eq)·e^(−t/τ),
// T_eq = T_out + Q/UA, τ = C/UA.
describe("lumped room, closed form", () => {
  it("with a constant heat input follows T_out + Q/UA + (T_0 − T_out − Q/UA)·exp(−t·UA/C)", () => {
    const heater: RoomDrive = { conductanceWPerK: 0, towardC: 0, watts: 1500 };
    const balance = roomBalance(room, [heater]);
    const tEq = 5 + 1500 / 50;
    const tau = 600_000 / 50;
    expect(equilibriumC(balance)).toBeCloseTo(tEq, 12);
    expect(timeConstantS(room, balance)).toBeCloseTo(tau, 12);
    for (const t of [0, 60, 600, 3600, 12_000, 86_400])
      expect(temperatureAfterC(18, t, room, balance)).toBeCloseTo(
        tEq + (18 - tEq) * Math.exp(-t / tau),
        10,
      );
  });

  it("undriven, after one time constant the gap to outdoors is 1/e of what it was (Newton's law of cooling)", () => {
    const balance = roomBalance(room, []);
    expect(temperatureAfterC(25, 12_000, room, balance)).toBeCloseTo(5 + 20 / Math.E, 10);
  });

  it("a unit's supply air through G and the envelope settle at (G·T_s + UA·T_out)/(G + UA)", () => {
    const unit: RoomDrive = { conductanceWPerK: 100, towardC: HEATING_SUPPLY_C, watts: 0 };
    const balance = roomBalance(room, [unit]);
    expect(equilibriumC(balance)).toBeCloseTo((100 * HEATING_SUPPLY_C + 50 * 5) / 150, 12);
    expect(timeConstantS(room, balance)).toBeCloseTo(600_000 / 150, 12);
  });

  it("splitting a span into pieces gives the same temperature (exp(−a)·exp(−b) = exp(−(a+b)))", () => {
    const balance = roomBalance(room, [{ conductanceWPerK: 80, towardC: 40, watts: 0 }]);
    const whole = temperatureAfterC(12, 900, room, balance);
    const pieces = temperatureAfterC(
      temperatureAfterC(temperatureAfterC(12, 100, room, balance), 300, room, balance),
      500,
      room,
      balance,
    );
    expect(pieces).toBeCloseTo(whole, 10);
  });

  it("secondsToReach inverts temperatureAfterC, and is Infinity past equilibrium", () => {
    const balance = roomBalance(room, [{ conductanceWPerK: 100, towardC: 45, watts: 0 }]);
    const t = secondsToReach(18, 22, room, balance);
    expect(temperatureAfterC(18, t, room, balance)).toBeCloseTo(22, 9);
    expect(secondsToReach(18, 40, room, balance)).toBe(Infinity);
    expect(secondsToReach(18, 10, room, balance)).toBe(Infinity);
  });

  it("NO_DRIVE leaves the balance to the envelope", () => {
    expect(roomBalance(room, [NO_DRIVE])).toEqual(roomBalance(room, []));
  });
});

describe("lumped room, properties", () => {
  const drive = fc.record({
    conductanceWPerK: fc.double({ min: 0, max: 1000, noNaN: true }),
    towardC: fc.constantFrom(HEATING_SUPPLY_C, COOLING_SUPPLY_C),
    watts: fc.constant(0),
  });
  const spec = fc.record({
    heatCapacityJPerK: fc.double({ min: 10_000, max: 10_000_000, noNaN: true }),
    envelopeUaWPerK: fc.double({ min: 1, max: 1000, noNaN: true }),
    outdoorC: fc.double({ min: -30, max: 40, noNaN: true }),
  });

  it("stays between the lowest and highest of start, outdoor and supply temperatures, and never jumps", () => {
    // The solution moves monotonically from T_0 to T_eq, a weighted mean of T_out and the supply
    // temperatures; its rate |dT/dt| = |T − T_eq|/τ bounds the change over any span.
    fc.assert(
      fc.property(
        spec,
        fc.array(drive, { maxLength: 3 }),
        fc.double({ min: -30, max: 50, noNaN: true }),
        fc.array(fc.double({ min: 0, max: 3600, noNaN: true }), { minLength: 1, maxLength: 20 }),
        (s, drives, startC, spans) => {
          const balance = roomBalance(s, drives);
          const bounds = [startC, s.outdoorC, ...drives.map((d) => d.towardC)];
          const low = Math.min(...bounds) - 1e-9;
          const high = Math.max(...bounds) + 1e-9;
          const tau = timeConstantS(s, balance);
          let tC = startC;
          for (const dtS of spans) {
            const next = temperatureAfterC(tC, dtS, s, balance);
            expect(next).toBeGreaterThanOrEqual(low);
            expect(next).toBeLessThanOrEqual(high);
            // No jump: the change is at most the gap to equilibrium times dt/τ (and never past it).
            const gap = Math.abs(tC - equilibriumC(balance));
            expect(Math.abs(next - tC)).toBeLessThanOrEqual(
              Math.min(gap, (gap * dtS) / tau) + 1e-9,
            );
            tC = next;
          }
        },
      ),
    );
  });
});
