import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { loadBench } from "@/engine";
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
