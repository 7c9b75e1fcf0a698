import { describe, expect, it } from "vitest";
import { getDeviceType, listDeviceTypes, registerDeviceType } from "./index";
import { pushButtonType } from "./push-button";

describe("catalogue", () => {
  it("holds the built-in types by id", () => {
    expect(getDeviceType("push-button")).toBe(pushButtonType);
    expect(getDeviceType("switch-actuator")?.label).toBe("Switch actuator");
    const ids = listDeviceTypes().map((t) => t.id);
    expect(ids).toEqual([...ids].sort());
    expect(ids).toEqual(expect.arrayContaining(["push-button", "switch-actuator"]));
  });

  it("refuses a second type under a taken id (a bug)", () => {
    expect(() => registerDeviceType({ ...pushButtonType })).toThrow(/already registered/);
    expect(() => registerDeviceType(pushButtonType)).not.toThrow();
  });
});
