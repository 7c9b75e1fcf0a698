import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
import { registerTestDevices, type RecorderState } from "@/test/harness";
import { parseGroupAddress } from "../../address";
import type { BenchInput } from "../../bench";
import { Tp1Sender } from "../../bus";
import type { TraceEvent } from "../../core/trace";
import { groupFrame } from "../group-objects";
import { BUS_FAULTS, createSimulation } from "../simulation";

beforeAll(registerTestDevices);

/**
 * Properties of couplers on a random building: backbone 0.0, main lines 1.0
 * and 2.0, lines 1.1, 1.2, 2.1, 2.2; each line and area coupler present or not,
 * with a random setting and a random stored table (or a generated one). The
 * expectations are written here from the standard's description
 * (knx-reference.md, Topology), not taken from the engine's own decisions:
 * a telegram crosses a coupler set to "forward", never one set to "block", and
 * one set to "filter" when its table holds the address or the address is in
 * main group 14 or 15 (from memory, see coupler-rules.ts).
 */

const LINES = ["0.0", "1.0", "1.1", "1.2", "2.0", "2.1", "2.2"] as const;
type Line = (typeof LINES)[number];
const ADDRESSES = ["1/0/1", "1/0/2", "2/0/1", "14/0/1"] as const;

/** Raw individual address of device `n` on a line ("1.2" -> 0x12nn). */
const individualOn = (line: string, n: number) => {
  const [area, number] = line.split(".").map(Number) as [number, number];
  return (area << 12) | (number << 8) | n;
};
const lineId = (line: string) => `line-${line.replace(".", "-")}`;
const upper = (line: Line): Line | undefined =>
  line === "0.0" ? undefined : line.endsWith(".0") ? "0.0" : (`${line[0]}.0` as Line);
const within = (line: Line, ancestor: Line): boolean => {
  for (let c: Line | undefined = line; c !== undefined; c = upper(c))
    if (c === ancestor) return true;
  return false;
};
/** Lower lines of the couplers between two lines (each coupler is named by its lower line). */
function couplersBetween(from: Line, to: Line): Line[] {
  const ups: Line[] = [];
  for (let c: Line | undefined = from; c !== undefined; c = upper(c)) ups.push(c);
  const downs: Line[] = [];
  let meet: Line | undefined = to;
  while (meet !== undefined && !ups.includes(meet)) {
    downs.push(meet);
    meet = upper(meet);
  }
  return [...ups.slice(0, ups.indexOf(meet!)), ...downs];
}

interface CouplerSpec {
  readonly present: boolean;
  readonly mode: "filter" | "forward" | "block";
  /** undefined: generated from the links. */
  readonly table: readonly string[] | undefined;
}
interface RecorderSpec {
  readonly line: Line;
  /** Addresses linked to object 0; the first is its sending address. */
  readonly addresses: readonly string[];
}
interface World {
  readonly couplers: Readonly<Record<Exclude<Line, "0.0">, CouplerSpec>>;
  readonly recorders: readonly RecorderSpec[];
  /** Lines with a device that answers NAK to everything it is linked to (forces repetitions there). */
  readonly nakLines: readonly Line[];
  readonly sends: readonly number[];
}

const couplerArb: fc.Arbitrary<CouplerSpec> = fc.record({
  present: fc.constantFrom(true, true, true, false),
  mode: fc.constantFrom("filter", "filter", "forward", "block"),
  table: fc.option(fc.subarray([...ADDRESSES]), { nil: undefined }),
});
const worldArb: fc.Arbitrary<World> = fc
  .record({
    couplers: fc.record({
      "1.0": couplerArb,
      "1.1": couplerArb,
      "1.2": couplerArb,
      "2.0": couplerArb,
      "2.1": couplerArb,
      "2.2": couplerArb,
    }),
    recorders: fc.array(
      fc.record({
        line: fc.constantFrom(...LINES),
        addresses: fc.shuffledSubarray([...ADDRESSES], { minLength: 1 }),
      }),
      { minLength: 2, maxLength: 7 },
    ),
    nakLines: fc.subarray([...LINES]),
  })
  .chain((w) =>
    fc
      .array(fc.integer({ min: 0, max: w.recorders.length - 1 }), { minLength: 1, maxLength: 5 })
      .map((sends) => ({ ...w, sends })),
  );

function benchOf(world: World): BenchInput {
  const devices: NonNullable<BenchInput["devices"]> = [];
  const links: NonNullable<BenchInput["links"]> = [];
  for (const [line, spec] of Object.entries(world.couplers)) {
    if (!spec.present) continue;
    devices.push({
      id: `c-${line.replace(".", "-")}`,
      type: "coupler",
      name: `coupler ${line}`,
      individualAddress: `${line}.0`,
      parameters: {
        groupTelegrams: spec.mode,
        ...(spec.table ? { filterTable: [...spec.table] } : {}),
      },
    });
  }
  world.recorders.forEach((r, i) => {
    devices.push({
      id: `r${i}`,
      type: "test-recorder",
      name: `r${i}`,
      individualAddress: `${r.line}.${i + 1}`,
      parameters: {},
    });
    for (const address of r.addresses)
      links.push({ device: `r${i}`, object: 0, groupAddress: address });
  });
  world.nakLines.forEach((line, i) => {
    devices.push({
      id: `nak${i}`,
      type: "test-recorder",
      name: `nak${i}`,
      individualAddress: `${line}.${100 + i}`,
      parameters: {},
    });
    for (const address of ADDRESSES)
      links.push({ device: `nak${i}`, object: 0, groupAddress: address });
  });
  return {
    format: 2,
    name: "random building",
    lines: LINES.map((address) => ({ id: lineId(address), address, name: address })),
    testToolAddress: "0.0.250",
    groupAddresses: ADDRESSES.map((address) => ({ address, name: address, dpt: "7.001" })),
    devices,
    links,
  };
}

/** The generated table by the rule in filter-table.ts, restated: a sender on one side, a listener on the other. */
function generatedHolds(world: World, lower: Line, address: string): boolean {
  const senders = world.recorders.filter((r) => r.addresses[0] === address).map((r) => r.line);
  const listeners = world.recorders.filter((r) => r.addresses.includes(address)).map((r) => r.line);
  return senders.some((s) => listeners.some((l) => within(s, lower) !== within(l, lower)));
}

function crosses(world: World, lower: Line, address: string): boolean {
  const spec = world.couplers[lower as Exclude<Line, "0.0">];
  if (!spec.present || spec.mode === "block") return false;
  if (spec.mode === "forward") return true;
  if (address.startsWith("14/") || address.startsWith("15/")) return true;
  return spec.table === undefined
    ? generatedHolds(world, lower, address)
    : spec.table.includes(address);
}

const numRuns = 60;

describe("coupler properties", () => {
  it("a group telegram reaches exactly the listeners topology and tables allow, each once despite repetitions", () => {
    fc.assert(
      fc.property(worldArb, (world) => {
        const sim = createSimulation(benchOf(world), { seed: 1, traceCapacity: 0 });
        world.nakLines.forEach((_, i) => sim.injectFault(`nak${i}`, BUS_FAULTS.nak));
        const expected: number[][] = world.recorders.map(() => []);
        world.sends.forEach((from, n) => {
          const value = 1000 + n;
          const address = world.recorders[from]!.addresses[0]!;
          const origin = world.recorders[from]!.line;
          world.recorders.forEach((r, i) => {
            if (i === from || !r.addresses.includes(address)) return;
            if (couplersBetween(origin, r.line).every((lower) => crosses(world, lower, address)))
              expected[i]!.push(value);
          });
          sim.setInput(`r${from}`, "send", value);
          // Long enough for four repetitions on each of up to five lines, so sends do not overlap.
          sim.runFor(3_000_000);
        });
        world.recorders.forEach((_, i) =>
          expect((sim.deviceState(`r${i}`) as RecorderState).writes).toEqual(expected[i]),
        );
      }),
      { numRuns },
    );
  });

  it("the routing counter never goes below zero and a telegram never reaches a line twice", () => {
    fc.assert(
      fc.property(
        worldArb,
        fc.array(
          fc.record({
            line: fc.constantFrom(...LINES),
            hopCount: fc.integer({ min: 0, max: 7 }),
            address: fc.constantFrom(...ADDRESSES),
            // Individually addressed to a device number on a random line, routed by address.
            to: fc.option(fc.constantFrom(...LINES), { nil: undefined }),
          }),
          { minLength: 1, maxLength: 6 },
        ),
        (world, probes) => {
          const open = {
            ...world,
            couplers: Object.fromEntries(
              Object.entries(world.couplers).map(([k, c]) => [
                k,
                { ...c, mode: "forward" as const },
              ]),
            ) as World["couplers"],
          };
          const sim = createSimulation(benchOf(open), { seed: 1 });
          const hopOf = new Map<number, number>();
          const rootOf = new Map<number, number>();
          probes.forEach((probe, i) => {
            const raw = parseGroupAddress(probe.address);
            if (!raw.ok) throw new Error(probe.address);
            const id = 1_000_000 + i;
            hopOf.set(id, probe.hopCount);
            rootOf.set(id, id);
            const sender = new Tp1Sender(0x0ffa, undefined, `probe${i}`);
            sim.line(lineId(probe.line)).queue(
              sender,
              {
                ...groupFrame(
                  0x0ffa,
                  probe.to === undefined ? raw.value : individualOn(probe.to, 200 + i),
                  "GroupValue_Write",
                  new Uint8Array([0, i]),
                  16,
                  "low",
                ),
                addressType: probe.to === undefined ? "group" : "individual",
                hopCount: probe.hopCount,
              },
              id,
            );
          });
          sim.runFor(5_000_000);
          const linesOf = new Map<number, string[]>();
          for (const event of sim.trace as readonly TraceEvent[]) {
            if (event.kind === "coupler.forward") {
              const before = hopOf.get(event.telegramId);
              if (before === undefined) continue; // a recorder's own telegram
              // knx-reference.md, Topology: 7 is never decremented, else one less per coupler; 0 is never passed.
              expect(before).toBeGreaterThan(0);
              expect(event.hopCount).toBe(before === 7 ? 7 : before - 1);
              expect(event.hopCount).toBeGreaterThanOrEqual(0);
              hopOf.set(event.forwardedTelegramId, event.hopCount);
              rootOf.set(event.forwardedTelegramId, rootOf.get(event.telegramId)!);
            }
            if (
              event.kind === "telegram.sent" &&
              event.attempt === 0 &&
              rootOf.has(event.telegramId)
            ) {
              const root = rootOf.get(event.telegramId)!;
              const seen = linesOf.get(root) ?? [];
              expect(seen).not.toContain(event.line);
              linesOf.set(root, [...seen, event.line]);
            }
          }
        },
      ),
      { numRuns },
    );
  });

  it("a line's busy and occupied time never exceed the time that passed", () => {
    fc.assert(
      fc.property(worldArb, fc.integer({ min: 1, max: 40 }), (world, flood) => {
        const sim = createSimulation(benchOf(world), { seed: 1, traceCapacity: 0 });
        world.nakLines.forEach((_, i) => sim.injectFault(`nak${i}`, BUS_FAULTS.nak));
        for (let i = 0; i < flood; i++) sim.sendGroupWrite(ADDRESSES[i % ADDRESSES.length]!, i);
        for (const from of world.sends) sim.setInput(`r${from}`, "send", from);
        sim.runFor(2_000_000);
        for (const line of LINES) {
          const model = sim.line(lineId(line));
          expect(model.busyUsTotal).toBeLessThanOrEqual(sim.nowUs);
          expect(model.occupiedUsTotal).toBeLessThanOrEqual(sim.nowUs);
          const window = model.stats(1_000_000);
          expect(window.busyUs).toBeLessThanOrEqual(1_000_000);
          expect(window.occupiedUs).toBeLessThanOrEqual(1_000_000);
        }
      }),
      { numRuns },
    );
  });
});
