import { describe, expect, it } from "vitest";
import { benchSchema, type Bench, type BenchInput } from "../bench/bench-schema";
import "../devices";
import { checkBench } from "./check-bench";

function bench(input: Partial<BenchInput>): Bench {
  return benchSchema.parse({
    format: 1,
    name: "fixture",
    lines: [{ id: "line-1", address: "1.1", name: "Line 1" }],
    testToolAddress: "1.1.250",
    ...input,
  });
}

const device = (id: string, type: string, parameters: Record<string, unknown> = {}, n = 0) => ({
  id,
  type,
  name: id,
  ...(type === "hvac-gateway" ? { individualAddress: `1.1.${20 + n}` } : {}),
  parameters,
});

const hvacRules = (b: Bench) =>
  checkBench(b)
    .filter((f) => /^(indoor-unit|controller|gateway)\./.test(f.rule))
    .map((f) => [f.rule, f.severity, f.location]);

describe("HVAC bench rules, counted per indoor unit", () => {
  it("two primaries on one indoor unit across its two links is one error (unit stops taking commands)", () => {
    // Common practice, no published source (knx-reference.md "Trade practice"): one primary per indoor unit.
    const b = bench({
      devices: [
        device("iu", "indoor-unit"),
        device("gw", "hvac-gateway", { role: "primary" }),
        device("wc", "wall-controller", { role: "primary" }),
      ],
      unitLinks: [
        { id: "link-gw", members: ["iu", "gw"] },
        { id: "link-wc", members: ["iu", "wc"] },
      ],
    });
    expect(hvacRules(b)).toEqual([
      ["indoor-unit.two-primaries", "error", { device: "iu", unitLink: "link-gw" }],
    ]);
  });

  it("a controller left at its default role counts as primary", () => {
    const b = bench({
      devices: [
        device("iu", "indoor-unit"),
        device("gw", "hvac-gateway"),
        device("wc", "wall-controller"),
      ],
      unitLinks: [{ id: "link", members: ["iu", "gw", "wc"] }],
    });
    expect(hvacRules(b).map((r) => r[0])).toEqual(["indoor-unit.two-primaries"]);
  });

  it("one primary and one secondary pass; none primary is a warning", () => {
    const link = [{ id: "link", members: ["iu", "gw", "wc"] }];
    const ok = bench({
      devices: [
        device("iu", "indoor-unit"),
        device("gw", "hvac-gateway", { role: "primary" }),
        device("wc", "wall-controller", { role: "secondary" }),
      ],
      unitLinks: link,
    });
    expect(hvacRules(ok)).toEqual([]);
    const none = bench({
      devices: [
        device("iu", "indoor-unit"),
        device("wc", "wall-controller", { role: "secondary" }),
      ],
      unitLinks: [{ id: "link", members: ["iu", "wc"] }],
    });
    expect(hvacRules(none)).toEqual([
      ["indoor-unit.no-primary", "warning", { device: "iu", unitLink: "link" }],
    ]);
  });

  it("a unit with no controller, and a controller with no unit, are warnings", () => {
    const b = bench({
      devices: [device("iu", "indoor-unit"), device("gw", "hvac-gateway")],
    });
    expect(hvacRules(b)).toEqual([
      ["controller.no-unit", "warning", { device: "gw" }],
      ["indoor-unit.no-controller", "warning", { device: "iu" }],
    ]);
  });

  it("a controller wired to two indoor units is an error", () => {
    // Common practice, no published source: a gateway or wall controller serves one indoor unit.
    const b = bench({
      devices: [
        device("iu-a", "indoor-unit"),
        device("iu-b", "indoor-unit"),
        device("gw", "hvac-gateway"),
      ],
      unitLinks: [
        { id: "a", members: ["iu-a", "gw"] },
        { id: "b", members: ["iu-b", "gw"] },
      ],
    });
    expect(hvacRules(b).map((r) => [r[0], r[1]])).toContainEqual([
      "controller.several-units",
      "error",
    ]);
  });

  it("an indoor unit on two outdoor units is an error", () => {
    const b = bench({
      devices: [
        device("iu", "indoor-unit"),
        device("gw", "hvac-gateway", { systemType: "multi-split" }),
        device("ou-1", "outdoor-unit"),
        device("ou-2", "outdoor-unit"),
      ],
      unitLinks: [
        { id: "ctl", members: ["iu", "gw"] },
        { id: "r1", members: ["iu", "ou-1"] },
        { id: "r2", members: ["iu", "ou-2"] },
      ],
    });
    expect(hvacRules(b)).toEqual([
      ["indoor-unit.several-outdoor-units", "error", { device: "iu", unitLink: "ctl" }],
    ]);
  });

  it("a single-split gateway on a shared outdoor unit, and a multi-split gateway on none, are warnings", () => {
    // Common practice, no published source (knx-reference.md "Trade practice"): one unit holds mode authority.
    const shared = bench({
      devices: [
        device("iu", "indoor-unit"),
        device("gw", "hvac-gateway", { systemType: "single-split" }),
        device("ou", "outdoor-unit"),
      ],
      unitLinks: [
        { id: "ctl", members: ["iu", "gw"] },
        { id: "refrigerant", members: ["iu", "ou"] },
      ],
    });
    expect(hvacRules(shared)).toEqual([
      [
        "gateway.single-split-on-outdoor-unit",
        "warning",
        { device: "gw", parameter: "systemType" },
      ],
    ]);
    const alone = bench({
      devices: [
        device("iu", "indoor-unit"),
        device("gw", "hvac-gateway", { systemType: "multi-split" }),
      ],
      unitLinks: [{ id: "ctl", members: ["iu", "gw"] }],
    });
    expect(hvacRules(alone)).toEqual([
      [
        "gateway.multi-split-without-outdoor-unit",
        "warning",
        { device: "gw", parameter: "systemType" },
      ],
    ]);
  });

  it("an outdoor unit following a leader that is not one of its indoor units is an error", () => {
    // Common practice, no published source: a fixed leader must be a member of the system.
    const withLeader = (leaderUnit: string) =>
      bench({
        devices: [
          device("iu", "indoor-unit"),
          device("gw", "hvac-gateway", { systemType: "multi-split" }),
          device("ou", "outdoor-unit", { modeAuthority: "leader", leaderUnit }),
        ],
        unitLinks: [
          { id: "ctl", members: ["iu", "gw"] },
          { id: "refrigerant", members: ["iu", "ou"] },
        ],
      });
    expect(hvacRules(withLeader("iu-typo"))).toEqual([]);
    expect(
      checkBench(withLeader("iu-typo"), { rules: ["outdoor-unit.leader-not-member"] }),
    ).toEqual([
      expect.objectContaining({
        severity: "error",
        location: { device: "ou", parameter: "leaderUnit" },
      }),
    ]);
    expect(checkBench(withLeader("iu"), { rules: ["outdoor-unit.leader-not-member"] })).toEqual([]);
  });
});
