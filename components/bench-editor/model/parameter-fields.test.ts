import { describe, expect, it } from "vitest";
import { getDeviceType } from "@/engine";
import { emptyValue, fieldLabel, parameterFields } from "./parameter-fields";

describe("parameterFields", () => {
  it("reads enums, numbers with bounds, booleans, nested objects and arrays from a type's schema", () => {
    const fields = parameterFields(getDeviceType("hvac-gateway")!.parameters);
    const byName = new Map(fields.map((f) => [f.name, f]));
    expect(byName.get("modeControl")).toMatchObject({
      kind: "enum",
      options: ["full", "simplified"],
      defaultValue: "full",
    });
    // The gateway offers 2..5 fan levels (product.md, HVAC gateway).
    expect(byName.get("fanLevels")).toMatchObject({
      kind: "number",
      min: 2,
      max: 5,
      integer: true,
      defaultValue: 3,
    });
    expect(byName.get("louvre")).toMatchObject({ kind: "boolean", defaultValue: false });
    const sending = byName.get("roomTemperatureSending");
    expect(sending?.kind).toBe("object");
    if (sending?.kind === "object")
      expect(sending.fields.map((f) => f.name)).toContain("roomTemperatureSending.deltaK");
    const scenes = byName.get("scenes");
    expect(scenes).toMatchObject({ kind: "array", maxItems: 16 });
    // DPT 17.001: scenes are numbered 1..64 for people, so a new slot starts at 1.
    if (scenes?.kind === "array")
      expect(emptyValue(scenes.element)).toMatchObject({ scene: 1, power: true, mode: "auto" });
  });

  it("labels parameters with their unit", () => {
    expect(fieldLabel("setpointMinC")).toBe("Setpoint min (°C)");
    expect(fieldLabel("staircaseS")).toBe("Staircase (s)");
    expect(fieldLabel("fanAuto")).toBe("Fan auto");
  });
});
