import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { benchSchema, checkBench, loadBench } from "@/engine";
import { applyHiddenFaults } from "./hidden-faults";

const fernhill = JSON.parse(
  readFileSync("scenarios/benches/fernhill-training-centre.bench.json", "utf8"),
) as {
  links: { device: string; object: number; groupAddress: string }[];
  devices: { id: string; parameters: Record<string, unknown> }[];
};

describe("applyHiddenFaults", () => {
  it("moves a link in place, so a relinked sending address stays the sending one", () => {
    const applied = applyHiddenFaults(fernhill, [
      { kind: "relink", device: "pb-door", object: 0, from: "1/0/1", to: "1/0/2" },
    ]);
    expect(applied.ok).toBe(true);
    if (!applied.ok) return;
    const links = (applied.value as typeof fernhill).links;
    const door = links.filter((l) => l.device === "pb-door" && l.object === 0);
    // Bench format: the first link of an object is its sending address (bench-schema.ts).
    expect(door[0]!.groupAddress).toBe("1/0/2");
    expect(loadBench(applied.value).ok).toBe(true);
    // The source document is untouched.
    expect(fernhill.links.find((l) => l.device === "pb-door")!.groupAddress).toBe("1/0/1");
  });

  it("removes a link and changes a parameter", () => {
    const applied = applyHiddenFaults(fernhill, [
      { kind: "unlink", device: "act-lab", object: 1, groupAddress: "1/1/1" },
      { kind: "set-parameter", device: "wc-front", parameter: "role", value: "primary" },
    ]);
    expect(applied.ok).toBe(true);
    if (!applied.ok) return;
    const bench = applied.value as typeof fernhill;
    expect(bench.links.some((l) => l.device === "act-lab" && l.object === 1)).toBe(false);
    expect(bench.devices.find((d) => d.id === "wc-front")!.parameters.role).toBe("primary");
  });

  it("names the field of a fault that does not fit the bench", () => {
    expect(
      applyHiddenFaults(fernhill, [
        { kind: "relink", device: "pb-door", object: 0, from: "3/0/1", to: "1/0/2" },
      ]),
    ).toMatchObject({ ok: false, error: { index: 0, field: "from" } });
    expect(
      applyHiddenFaults(fernhill, [
        { kind: "relink", device: "pb-door", object: 0, from: "1/0/1", to: "9/0/9" },
      ]),
    ).toMatchObject({ ok: false, error: { field: "to" } });
    expect(
      applyHiddenFaults(fernhill, [
        { kind: "unlink", device: "nobody", object: 0, groupAddress: "1/0/1" },
      ]),
    ).toMatchObject({ ok: false, error: { field: "device" } });
  });
});

const hotel = JSON.parse(readFileSync("scenarios/benches/wrenhallow-hotel.bench.json", "utf8")) as {
  devices: { id: string; parameters: Record<string, unknown> }[];
};
const couplerParameters = (bench: unknown, id: string) =>
  (bench as typeof hotel).devices.find((d) => d.id === id)!.parameters;

describe("a stale filter table hidden in a lab", () => {
  it("stores the coupler's generated table without the address, so the coupler blocks it", () => {
    const applied = applyHiddenFaults(hotel, [
      { kind: "stale-filter-table", coupler: "lc-floor-2", groupAddress: "4/0/1" },
    ]);
    expect(applied.ok).toBe(true);
    if (!applied.ok) return;
    const table = couplerParameters(applied.value, "lc-floor-2").filterTable as string[];
    // The floor's other crossing address stays: only the one entry goes stale.
    expect(table).toContain("4/1/1");
    expect(table).not.toContain("4/0/1");
    // The other floors keep tables generated from the links (nothing stored).
    expect(couplerParameters(applied.value, "lc-floor-1").filterTable).toBeUndefined();
    expect(couplerParameters(hotel, "lc-floor-2").filterTable).toBeUndefined();
    // The bench still loads, and its checks name the coupler and the missing entry.
    expect(loadBench(applied.value).ok).toBe(true);
    const blocked = checkBench(benchSchema.parse(applied.value)).filter(
      (f) => f.rule === "topology.filter-blocks",
    );
    expect(blocked.map((f) => f.message).join("\n")).toMatch(/4\/0\/1/);
    expect(blocked.map((f) => f.message).join("\n")).toMatch(/lc-floor-2|Floor 2 line coupler/);
  });

  it("removes the address from a table the bench already stores", () => {
    const first = applyHiddenFaults(hotel, [
      { kind: "stale-filter-table", coupler: "lc-floor-3", groupAddress: "4/0/1" },
    ]);
    if (!first.ok) throw new Error(first.error.message);
    const second = applyHiddenFaults(first.value, [
      { kind: "stale-filter-table", coupler: "lc-floor-3", groupAddress: "4/1/1" },
    ]);
    if (!second.ok) throw new Error(second.error.message);
    expect(couplerParameters(second.value, "lc-floor-3").filterTable).toEqual([]);
  });

  it("names the field when the fault does not fit the bench", () => {
    // 2/0/1 stays on floor 2 (push-button and actuator on one line): no coupler passes it.
    expect(
      applyHiddenFaults(hotel, [
        { kind: "stale-filter-table", coupler: "lc-floor-2", groupAddress: "2/0/1" },
      ]),
    ).toMatchObject({ ok: false, error: { index: 0, field: "groupAddress" } });
    expect(
      applyHiddenFaults(hotel, [
        { kind: "stale-filter-table", coupler: "pb-central", groupAddress: "4/0/1" },
      ]),
    ).toMatchObject({ ok: false, error: { field: "coupler" } });
    expect(
      applyHiddenFaults(hotel, [
        { kind: "stale-filter-table", coupler: "lc-floor-2", groupAddress: "not an address" },
      ]),
    ).toMatchObject({ ok: false, error: { field: "groupAddress" } });
  });
});
