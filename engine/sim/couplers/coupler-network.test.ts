import { beforeAll, describe, expect, it } from "vitest";
import { benchBuilder, registerTestDevices, type RecorderState } from "@/test/harness";
import { Tp1Sender } from "../../bus";
import type { TraceEvent } from "../../core/trace";
import { groupFrame } from "../group-objects";
import { BUS_FAULTS, createSimulation, type Simulation } from "../simulation";
import { parseGroupAddress } from "../../address";

beforeAll(registerTestDevices);

/**
 * Two areas: backbone 0.0, main lines 1.0 and 2.0, lines 1.1, 1.2 and 2.1,
 * a line coupler per line and an area coupler per area (knx-reference.md,
 * Topology: a.l.0 joins a.l to a.0, a.0.0 joins a.0 to 0.0). A recorder on
 * 1.1 sends on 1/0/1; recorders on 1.2 and 2.1 listen to it.
 */
function building(couplerParameters: Record<string, Record<string, unknown>> = {}) {
  const b = benchBuilder()
    .mainLine("l11", "1.1")
    .line("bb", "0.0")
    .line("m1", "1.0")
    .line("l12", "1.2")
    .line("m2", "2.0")
    .line("l21", "2.1")
    .testTool("1.1.250")
    .groupAddress("1/0/1", "7.001")
    .groupAddress("1/0/2", "7.001")
    .groupAddress("14/0/1", "7.001");
  for (const [id, address] of [
    ["c11", "1.1.0"],
    ["c12", "1.2.0"],
    ["c21", "2.1.0"],
    ["a1", "1.0.0"],
    ["a2", "2.0.0"],
  ] as const)
    b.device(id, "coupler", address, couplerParameters[id] ?? {});
  return b
    .device("sender", "test-recorder", "1.1.1")
    .device("near", "test-recorder", "1.2.1")
    .device("far", "test-recorder", "2.1.1")
    .device("local", "test-recorder", "1.1.2")
    .link("sender", 0, "1/0/1")
    .link("near", 0, "1/0/1")
    .link("far", 0, "1/0/1")
    .link("local", 0, "1/0/2")
    .build();
}

const writes = (sim: Simulation, id: string) => (sim.deviceState(id) as RecorderState).writes;
const kinds = (trace: readonly TraceEvent[], kind: string) => trace.filter((e) => e.kind === kind);
const send = (sim: Simulation, value: number) =>
  sim.setInput("sender", "send", value).ok || expect.fail("send refused");

describe("couplers between lines", () => {
  it("pass a group telegram along the path to every listener, each exactly once", () => {
    const sim = createSimulation(building(), { seed: 1 });
    send(sim, 42);
    sim.runFor(2_000_000);
    expect(writes(sim, "near")).toEqual([42]);
    expect(writes(sim, "far")).toEqual([42]);
    const forwards = kinds(sim.trace, "coupler.forward") as Extract<
      TraceEvent,
      { kind: "coupler.forward" }
    >[];
    // Up through c11, then a1 (to the backbone) and c12 (down to 1.2), then a2 and c21.
    expect(forwards.map((f) => f.coupler).sort()).toEqual(["a1", "a2", "c11", "c12", "c21"]);
    // knx-reference.md, Topology: the routing counter drops by one per coupler (devices send 6).
    expect(forwards.find((f) => f.coupler === "c11")?.hopCount).toBe(5);
    expect(forwards.find((f) => f.coupler === "c21")?.hopCount).toBe(2);
    // Every line carries the telegram once: 1.1, 1.0, 0.0, 1.2, 2.0, 2.1.
    const sent = kinds(sim.trace, "telegram.sent") as Extract<
      TraceEvent,
      { kind: "telegram.sent" }
    >[];
    expect(
      sent
        .filter((e) => e.attempt === 0)
        .map((e) => e.line)
        .sort(),
    ).toEqual(["bb", "l11", "l12", "l21", "m1", "m2"].sort());
  });

  it("keeps an address used only inside a line off the other lines, without tracing a drop", () => {
    const sim = createSimulation(
      benchBuilder()
        .mainLine("l11", "1.1")
        .line("m1", "1.0")
        .groupAddress("1/0/2", "7.001")
        .device("c11", "coupler", "1.1.0")
        .device("a", "test-recorder", "1.1.1")
        .device("b", "test-recorder", "1.1.2")
        .link("a", 0, "1/0/2")
        .link("b", 0, "1/0/2")
        .build(),
      { seed: 1 },
    );
    sim.setInput("a", "send", 7);
    sim.runFor(1_000_000);
    expect(writes(sim, "b")).toEqual([7]);
    expect(kinds(sim.trace, "coupler.forward")).toEqual([]);
    expect(kinds(sim.trace, "coupler.drop")).toEqual([]);
    expect(sim.line("m1").telegramsTotal).toBe(0);
  });

  // A coupler acknowledges only what it passes on (knx-reference.md, Topology: couplers acknowledge on the receiving side).
  it("a stale stored table filters a needed address: no acknowledgement, a traced drop, no delivery beyond", () => {
    const sim = createSimulation(building({ c12: { filterTable: ["1/0/2"] } }), { seed: 1 });
    send(sim, 5);
    sim.runFor(2_000_000);
    expect(writes(sim, "far")).toEqual([5]);
    expect(writes(sim, "near")).toEqual([]);
    const drops = kinds(sim.trace, "coupler.drop") as Extract<
      TraceEvent,
      { kind: "coupler.drop" }
    >[];
    expect(drops).toEqual([
      expect.objectContaining({ coupler: "c12", reason: "filter", fromLine: "m1", toLine: "l12" }),
    ]);
    expect(sim.couplerCounts().get("c12")?.dropped.filter).toBe(1);
  });

  it("block stops every group telegram, forward passes every one", () => {
    const blocked = createSimulation(building({ a1: { groupTelegrams: "block" } }), { seed: 1 });
    send(blocked, 1);
    blocked.runFor(2_000_000);
    expect(writes(blocked, "near")).toEqual([1]);
    expect(writes(blocked, "far")).toEqual([]);
    expect(kinds(blocked.trace, "coupler.drop")).toEqual([
      expect.objectContaining({ coupler: "a1", reason: "blocked" }),
    ]);

    const open = createSimulation(building({ c11: { groupTelegrams: "forward" } }), { seed: 1 });
    open.setInput("local", "send", 3);
    open.runFor(2_000_000);
    // Nobody outside 1.1 listens to 1/0/2: the main line carries it, and nobody acknowledges it there.
    expect(open.line("m1").telegramsTotal).toBe(1);
    expect(kinds(open.trace, "coupler.drop")).toEqual([
      expect.objectContaining({ coupler: "c11", reason: "not-acknowledged" }),
    ]);
    // Heard on 1.1, lost on 1.0: the fields in the order the golden traces store them.
    const [lost] = kinds(open.trace, "coupler.drop");
    expect(Object.keys(lost!)).toEqual([
      "kind",
      "timeUs",
      "coupler",
      "telegramId",
      "forwardedTelegramId",
      "fromLine",
      "toLine",
      "destination",
      "reason",
    ]);
    expect(lost).toMatchObject({ fromLine: "l11", toLine: "m1" });
  });

  // From memory (Basic course): main groups 14 and 15 pass a filtering coupler without a table entry.
  it("main group 14 passes filtering couplers with empty stored tables", () => {
    const empty = { filterTable: [] };
    const sim = createSimulation(
      building({ c11: empty, a1: empty, a2: empty, c21: empty, c12: empty }),
      { seed: 1 },
    );
    sim.sendGroupWrite("14/0/1", 9);
    sim.runFor(2_000_000);
    expect(sim.line("l21").telegramsTotal).toBe(1);
    expect(kinds(sim.trace, "coupler.forward")).toHaveLength(5);
  });

  it("the routing counter: 0 is not passed, 7 passes undecreased", () => {
    const sim = createSimulation(building(), { seed: 1 });
    const tool = new Tp1Sender(0x11fa, undefined, "probe");
    const raw = parseGroupAddress("1/0/1");
    if (!raw.ok) throw new Error("address");
    for (const [hopCount, id] of [
      [0, 1_000_000],
      [7, 1_000_001],
    ] as const)
      sim.line("l11").queue(
        tool,
        {
          ...groupFrame(
            0x11fa,
            raw.value,
            "GroupValue_Write",
            new Uint8Array([0, hopCount]),
            16,
            "low",
          ),
          hopCount,
        },
        id,
      );
    sim.runFor(2_000_000);
    const drops = kinds(sim.trace, "coupler.drop") as Extract<
      TraceEvent,
      { kind: "coupler.drop" }
    >[];
    expect(drops).toEqual([
      expect.objectContaining({ telegramId: 1_000_000, coupler: "c11", reason: "hop-count" }),
    ]);
    const forwards = kinds(sim.trace, "coupler.forward") as Extract<
      TraceEvent,
      { kind: "coupler.forward" }
    >[];
    expect(forwards.every((f) => f.hopCount === 7)).toBe(true);
    expect(writes(sim, "far")).toEqual([7]);
  });

  it("a full buffer answers BUSY and traces queue-full; a sender whose repetitions all meet it gives up", () => {
    const bench = { ...building({ c11: { queueCapacity: 1 } }), testToolAddress: "1.0.250" };
    const sim = createSimulation(bench, { seed: 1 });
    // The test tool keeps the main line busy at system priority (it wins arbitration over the
    // coupler's low-priority copies; knx-reference.md, TP1 standard frame), so c11's buffer fills.
    for (let i = 0; i < 10; i++) sim.sendGroupWrite("1/0/2", i, { priority: "system" });
    for (let i = 0; i < 3; i++) send(sim, 100 + i);
    sim.runFor(10_000_000);
    const drops = kinds(sim.trace, "coupler.drop") as Extract<
      TraceEvent,
      { kind: "coupler.drop" }
    >[];
    expect(drops.some((d) => d.coupler === "c11" && d.reason === "queue-full")).toBe(true);
    expect(kinds(sim.trace, "coupler.hold").length).toBeGreaterThan(0);
    // knx-reference.md, TP1 timing: after BUSY the sender repeats (3 times at most, 150 bit times apart);
    // while the main line stays busy the repetitions meet a full buffer too, and the sender gives up.
    const lost = kinds(sim.trace, "telegram.lost") as Extract<
      TraceEvent,
      { kind: "telegram.lost" }
    >[];
    const lostOnLine = lost.filter((e) => e.line === "l11");
    expect(lostOnLine.every((e) => e.reason === "busy")).toBe(true);
    expect(writes(sim, "far").length + lostOnLine.length).toBe(3);
    expect(writes(sim, "far")[0]).toBe(100);
    expect(sim.couplerCounts().get("c11")?.dropped["queue-full"]).toBeGreaterThan(0);
  });

  it("a silent coupler (bus fault) passes nothing", () => {
    const sim = createSimulation(building(), { seed: 1 });
    sim.injectFault("c11", BUS_FAULTS.silent);
    send(sim, 8);
    sim.runFor(2_000_000);
    expect(writes(sim, "near")).toEqual([]);
    expect(writes(sim, "far")).toEqual([]);
  });

  it("a fork carries the couplers' buffers and goes on as the original does", () => {
    const sim = createSimulation(building(), { seed: 1 });
    send(sim, 11);
    sim.runFor(30_000); // the first frame is on 1.1; copies are queued or in flight
    const fork = sim.fork();
    sim.runFor(2_000_000);
    fork.runFor(2_000_000);
    expect(writes(fork, "far")).toEqual(writes(sim, "far"));
    expect(writes(fork, "near")).toEqual([11]);
    expect(fork.trace.length).toBe(sim.trace.length);
  });

  it("a parameter download to a coupler takes effect at once", () => {
    const sim = createSimulation(building(), { seed: 1 });
    expect(sim.setParameter("c21", "groupTelegrams", "block").ok).toBe(true);
    send(sim, 4);
    sim.runFor(2_000_000);
    expect(writes(sim, "far")).toEqual([]);
    expect(writes(sim, "near")).toEqual([4]);
  });

  // Routing by address (knx-reference.md, Topology: a.l.0 joins a.l to a.0, a.0.0 joins a.0 to 0.0).
  it("routes an individually addressed telegram along the path to its destination only", () => {
    const probe = (bench: ReturnType<typeof building>, destination: number) => {
      const sim = createSimulation(bench, { seed: 1 });
      const tool = new Tp1Sender(0x11fa, undefined, "probe");
      const frame = groupFrame(0x11fa, destination, "GroupValue_Read", new Uint8Array(0), 1, "low");
      sim.line("l11").queue(tool, { ...frame, addressType: "individual" }, 1_000_000);
      sim.runFor(2_000_000);
      return sim;
    };
    const toFar = probe(building(), 0x2101); // 2.1.1
    const forwards = kinds(toFar.trace, "coupler.forward") as Extract<
      TraceEvent,
      { kind: "coupler.forward" }
    >[];
    expect(forwards.map((f) => f.coupler)).toEqual(["c11", "a1", "a2", "c21"]);
    expect(forwards.every((f) => f.individual === true)).toBe(true);
    // The addressed device acknowledges on its line; nobody repeats.
    expect(kinds(toFar.trace, "telegram.repeated")).toEqual([]);
    expect(toFar.line("l12").telegramsTotal).toBe(0);

    const local = probe(building(), 0x1102); // 1.1.2, on the sender's own line
    expect(kinds(local.trace, "coupler.forward")).toEqual([]);
    expect(kinds(local.trace, "coupler.drop")).toEqual([]);

    const blocked = probe(building({ a1: { individualTelegrams: "block" } }), 0x2101);
    // a1 blocks it (traced once), so nobody acknowledges c11's copy on the main line either.
    expect(kinds(blocked.trace, "coupler.drop")).toEqual([
      expect.objectContaining({ coupler: "a1", reason: "blocked", individual: true }),
      expect.objectContaining({ coupler: "c11", reason: "not-acknowledged", individual: true }),
    ]);
    expect(blocked.line("l21").telegramsTotal).toBe(0);
  });
});
