import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { benchSchema, loadBench, type Bench } from "@/engine";
import {
  addArea,
  addCoupler,
  addFilterEntry,
  addLine,
  filterTableRows,
  followLinks,
  generatedFilterTable,
  proposedCouplerAddress,
  regenerateFilterTable,
  removeFilterEntry,
  setGroupTelegrams,
  storedFilterTable,
} from "./topology";

const hotel = (): Bench =>
  benchSchema.parse(
    JSON.parse(readFileSync("scenarios/benches/wrenhallow-hotel.bench.json", "utf8")),
  );

function value<T>(result: { ok: true; value: T } | { ok: false; error: { message: string } }): T {
  if (!result.ok) throw new Error(result.error.message);
  return result.value;
}

const coupler = (bench: Bench, id: string) => bench.devices.find((d) => d.id === id)!;

describe("topology edits", () => {
  it("adds a line and refuses one that exists or is out of range", () => {
    const { bench } = value(addLine(hotel(), { area: 1, line: 4, name: "Floor 4" }));
    expect(bench.lines.at(-1)).toMatchObject({ address: "1.4", name: "Floor 4" });
    expect(addLine(bench, { area: 1, line: 4 })).toMatchObject({
      ok: false,
      error: { kind: "edit.line-exists", field: "line" },
    });
    // knx-reference.md, Topology: up to 15 lines per area and 15 areas.
    expect(addLine(bench, { area: 1, line: 16 })).toMatchObject({
      ok: false,
      error: { field: "line" },
    });
    expect(addLine(bench, { area: 16, line: 1 })).toMatchObject({
      ok: false,
      error: { field: "area" },
    });
  });

  it("adds an area with its main line a.0 and its name", () => {
    const { bench } = value(addArea(hotel(), { area: 2, name: "Annexe" }));
    expect(bench.lines.at(-1)).toMatchObject({ address: "2.0" });
    expect(bench.areas).toEqual([
      { number: 1, name: "Hotel" },
      { number: 2, name: "Annexe" },
    ]);
    expect(loadBench(bench).ok).toBe(true);
  });

  it("proposes a.l.0 for a line coupler and a.0.0 for an area coupler, none for the backbone", () => {
    // knx-reference.md, Topology: line coupler a.l.0, area coupler a.0.0.
    expect(proposedCouplerAddress({ id: "x", address: "1.4", name: "x" })).toBe("1.4.0");
    expect(proposedCouplerAddress({ id: "x", address: "2.0", name: "x" })).toBe("2.0.0");
    expect(proposedCouplerAddress({ id: "x", address: "0.0", name: "x" })).toBeUndefined();
  });

  it("adds a coupler at the proposed address once the line above exists", () => {
    const withLine = value(addLine(hotel(), { area: 1, line: 4 }));
    const added = value(addCoupler(withLine.bench, withLine.lineId));
    expect(coupler(added.bench, added.deviceId)).toMatchObject({
      type: "coupler",
      individualAddress: "1.4.0",
      line: withLine.lineId,
      parameters: { groupTelegrams: "filter", individualTelegrams: "route" },
    });
    expect(loadBench(added.bench).ok).toBe(true);
    // A second coupler on the same line would take a taken address.
    expect(addCoupler(added.bench, withLine.lineId)).toMatchObject({
      ok: false,
      error: { kind: "edit.address-taken" },
    });
    // Main line 1.0 needs the backbone above it first.
    expect(addCoupler(hotel(), "line-main")).toMatchObject({
      ok: false,
      error: { kind: "edit.coupler-invalid" },
    });
  });

  it("regenerates, edits by hand and drops a coupler's stored filter table", () => {
    let bench = hotel();
    const generated = generatedFilterTable(bench, "lc-floor-2");
    expect(generated).toEqual(["4/0/1", "4/1/1"]);
    expect(storedFilterTable(coupler(bench, "lc-floor-2"))).toBeUndefined();
    bench = value(regenerateFilterTable(bench, "lc-floor-2"));
    expect(storedFilterTable(coupler(bench, "lc-floor-2"))).toEqual(generated);

    bench = value(removeFilterEntry(bench, "lc-floor-2", "4/0/1"));
    expect(filterTableRows(bench, coupler(bench, "lc-floor-2"))).toEqual([
      { address: "4/0/1", inTable: false, needed: true },
      { address: "4/1/1", inTable: true, needed: true },
    ]);
    bench = value(addFilterEntry(bench, "lc-floor-2", "1/0/1"));
    expect(filterTableRows(bench, coupler(bench, "lc-floor-2"))).toContainEqual({
      address: "1/0/1",
      inTable: true,
      needed: false,
    });
    expect(addFilterEntry(bench, "lc-floor-2", "nine")).toMatchObject({
      ok: false,
      error: { field: "filterTable" },
    });
    bench = value(followLinks(bench, "lc-floor-2"));
    expect(storedFilterTable(coupler(bench, "lc-floor-2"))).toBeUndefined();
    bench = value(setGroupTelegrams(bench, "lc-floor-2", "block"));
    expect(coupler(bench, "lc-floor-2").parameters.groupTelegrams).toBe("block");
    expect(loadBench(bench).ok).toBe(true);
  });
});
