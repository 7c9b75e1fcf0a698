import { beforeAll, describe, expect, it } from "vitest";
import { benchBuilder, registerTestDevices, twoFloorsFixture } from "@/test/harness";
import { benchSchema, loadBench } from "../bench";
import { benchTopology, generateFilterTable, generateFilterTableTexts } from "../topology";
import { checkBench } from "./check-bench";
import { estimateLineLoad } from "./line-load";
import { benchView } from "./bench-view";

beforeAll(registerTestDevices);

/** Sender on 1.1, listener on 1.2 (and 1/0/9, used by nobody), both lines under main line 1.0. */
const twoFloors = (c12: Record<string, unknown> = {}) =>
  twoFloorsFixture(c12).groupAddress("1/0/9", "7.001");

const check = (doc: unknown, rule: string) => checkBench(benchSchema.parse(doc), { rules: [rule] });

describe("topology checks", () => {
  it("a stale stored table: an error naming the coupler and the missing entry", () => {
    const findings = check(twoFloors({ filterTable: [] }).build(), "topology.filter-blocks");
    expect(findings).toEqual([
      expect.objectContaining({
        severity: "error",
        location: { device: "c12", groupAddress: "1/0/1", parameter: "filterTable" },
      }),
    ]);
    expect(findings[0]!.message).toContain("has no entry 1/0/1 in its filter table");
  });

  it("generated tables pass every crossing, so a fresh bench has no finding", () => {
    expect(check(twoFloors().build(), "topology.filter-blocks")).toEqual([]);
  });

  it("a coupler set to block: an error naming it", () => {
    const findings = check(
      twoFloors({ groupTelegrams: "block" }).build(),
      "topology.filter-blocks",
    );
    expect(findings[0]).toMatchObject({ severity: "error", location: { device: "c12" } });
  });

  it("lines with no coupler between them: a warning that telegrams stay on their line", () => {
    const doc = twoFloors().build();
    doc.devices = doc.devices.filter((d) => d.id !== "c12");
    expect(check(doc, "topology.filter-blocks")[0]).toMatchObject({ severity: "warning" });
  });

  it("stored entries nothing needs across the coupler: info per entry", () => {
    const findings = check(
      twoFloors({ filterTable: ["1/0/1", "1/0/9"] }).build(),
      "topology.filter-unused",
    );
    expect(findings).toEqual([
      expect.objectContaining({
        severity: "info",
        location: { device: "c12", groupAddress: "1/0/9", parameter: "filterTable[1]" },
      }),
    ]);
  });

  it("a device addressed for another line than it sits on: an error", () => {
    const doc = twoFloors().device("x", "test-recorder", "1.1.7", {}, { line: "l12" }).build();
    expect(check(doc, "topology.address-wrong-line")).toEqual([
      expect.objectContaining({ severity: "error", location: { device: "x", line: "l12" } }),
    ]);
  });

  // knx-reference.md, Topology: 64 devices per segment; up to 4 segments per line with repeaters
  // (the reference marks the segment count from memory).
  it("more than 64 devices on a line: a warning; more than 256: an error", () => {
    const b = benchBuilder().mainLine("l11", "1.1").line("l12", "1.2");
    for (let i = 1; i <= 65; i++) b.device(`d${i}`, "test-recorder", `1.1.${i}`);
    expect(check(b.build(), "topology.line-limits")).toEqual([
      expect.objectContaining({ severity: "warning", location: { line: "l11" } }),
    ]);
    for (let i = 1; i <= 192; i++)
      b.device(`e${i}`, "test-recorder", `1.2.${i}`, {}, { line: "l11" });
    expect(check(b.build(), "topology.line-limits")).toEqual([
      expect.objectContaining({ severity: "error", location: { line: "l11" } }),
    ]);
  });

  it("expected load counts what couplers pass into a line", () => {
    const doc = benchSchema.parse(
      twoFloors()
        .device("sensor", "room-temperature-sensor", "1.1.3", {
          sending: { mode: "cyclic", minIntervalS: 0, cycleS: 10 },
        })
        .groupAddress("1/0/5", "9.001")
        .link("sensor", 0, "1/0/5")
        .device("panel", "control-panel", "1.2.3", {
          tiles: [{ label: "Room", dpt: "9.001", kind: "status" }],
        })
        .link("panel", 0, "1/0/5")
        .build(),
    );
    const byLine = new Map(estimateLineLoad(benchView(doc)).map((e) => [e.line, e]));
    expect(byLine.get("l11")!.telegramsPerSecond).toBeCloseTo(0.1);
    expect(byLine.get("m1")!.telegramsPerSecond).toBeCloseTo(0.1);
    expect(byLine.get("l12")!.contributions[0]).toMatchObject({
      device: "sensor",
      forwardedFrom: "l11",
    });
  });
});

describe("topology of a loaded bench", () => {
  it("lists areas and lines with kinds, counts and couplers, and generates tables", () => {
    const loaded = loadBench(twoFloors().build());
    if (!loaded.ok) throw new Error(loaded.error[0]!.message);
    const topology = benchTopology(loaded.value);
    expect(topology.areas).toHaveLength(1);
    expect(
      topology.areas[0]!.lines.map((l) => [l.address, l.kind, l.deviceCount, l.couplerId ?? ""]),
    ).toEqual([
      ["1.0", "main", 0, ""],
      ["1.1", "line", 2, "c11"],
      ["1.2", "line", 2, "c12"],
    ]);
    expect(generateFilterTableTexts(loaded.value, "c11")).toEqual(["1/0/1"]);
    expect(generateFilterTable(loaded.value, "c12")).toEqual([0x0801]);
    expect(() => generateFilterTable(loaded.value, "s")).toThrow(/no coupler/);
  });
});
