import { describe, expect, it } from "vitest";
import { checkHvacBench, validateHvacBench, type HvacBenchInput } from "./bench-rules";

function single(
  gateway: Record<string, unknown>,
  wallController?: Record<string, unknown>,
): HvacBenchInput {
  const devices = [
    { id: "gw", type: "hvac-gateway", parameters: gateway },
    { id: "unit", type: "indoor-unit", parameters: {} },
    ...(wallController === undefined
      ? []
      : [{ id: "wc", type: "wall-controller", parameters: wallController }]),
  ];
  return { devices, unitLinks: [{ id: "link", members: devices.map((d) => d.id) }] };
}

const rules = (bench: HvacBenchInput) => checkHvacBench(bench).map((f) => f.rule);

describe("HVAC bench rules", () => {
  it("accept a primary gateway with an external room temperature", () => {
    expect(validateHvacBench(single({ roomTemperatureSource: "external" }))).toEqual({
      ok: true,
      value: [],
    });
  });

  it("reject an external room temperature on a secondary gateway with a clear error naming the field", () => {
    // Common practice, no published source: only the primary may supply the room temperature.
    const result = validateHvacBench(
      single({ roomTemperatureSource: "external", role: "secondary" }, { role: "primary" }),
    );
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.error).toEqual([
      {
        rule: "hvac.external-temperature-on-secondary",
        severity: "error",
        message:
          "gw: an external room temperature is only allowed on a primary gateway; make it primary or use the unit's sensor",
        path: "devices[0].parameters.roomTemperatureSource",
        device: "gw",
      },
    ]);
  });

  it("warn about two primaries and about none, without rejecting (labs use them on purpose)", () => {
    // Common practice, no published source: one primary per indoor unit.
    const two = single({}, { role: "primary" });
    expect(rules(two)).toEqual(["hvac.two-primaries"]);
    expect(validateHvacBench(two).ok).toBe(true);
    expect(rules(single({ role: "secondary" }))).toEqual(["hvac.no-primary"]);
  });

  it("reject a controller whose links reach two indoor units", () => {
    const bench: HvacBenchInput = {
      devices: [
        { id: "gw", type: "hvac-gateway" },
        { id: "a", type: "indoor-unit" },
        { id: "b", type: "indoor-unit" },
      ],
      unitLinks: [{ id: "l", members: ["gw", "a", "b"] }],
    };
    expect(rules(bench)).toContain("hvac.controller-several-units");
  });

  it("check the system type against the outdoor unit", () => {
    const bench: HvacBenchInput = {
      devices: [
        { id: "gw-a", type: "hvac-gateway", parameters: { systemType: "multi-split" } },
        { id: "gw-b", type: "hvac-gateway", parameters: {} },
        { id: "a", type: "indoor-unit" },
        { id: "b", type: "indoor-unit" },
        { id: "out", type: "outdoor-unit" },
      ],
      unitLinks: [
        { id: "la", members: ["gw-a", "a"] },
        { id: "lb", members: ["gw-b", "b"] },
        { id: "sys", members: ["out", "a", "b"] },
      ],
    };
    expect(rules(bench)).toEqual(["hvac.single-split-on-outdoor-unit"]);
    expect(rules(single({ systemType: "multi-split" }))).toEqual([
      "hvac.multi-split-without-outdoor-unit",
    ]);
  });

  it("report invalid controller parameters with the field path", () => {
    const result = checkHvacBench(single({ setpointMinC: 30, setpointMaxC: 20 }));
    expect(result[0]).toMatchObject({
      rule: "hvac.parameters-invalid",
      path: "devices[0].parameters.setpointMinC",
    });
  });
});
