import { describe, expect, it } from "vitest";
import { DeviceHarness } from "../../../test/harness/device-harness";
import { binaryInputType, BINARY_INPUT_OBJECT } from "./binary-input";

function contact(parameters: Record<string, unknown> = {}) {
  return new DeviceHarness([{ id: "in", type: binaryInputType, parameters }]).start();
}

describe("binary input / window contact", () => {
  it("sends 1 when the window opens and 0 when it closes on DPT 1.019", () => {
    // DPT 1.019 window/door: 0 closed, 1 open (recalled from memory of the DPT spec).
    const h = contact();
    expect(binaryInputType.groupObjects(binaryInputType.parameters.parse({}))[0]?.dpt).toBe(
      "1.019",
    );
    expect(h.dispatch("in", { kind: "input", input: "contact", value: true }).transition).toBe(
      "window.opened",
    );
    expect(h.dispatch("in", { kind: "input", input: "contact", value: false }).transition).toBe(
      "window.closed",
    );
    expect(h.sentFrom("in", BINARY_INPUT_OBJECT).map((t) => t.value)).toEqual([true, false]);
  });

  it("sends only on change", () => {
    const h = contact();
    h.dispatch("in", { kind: "input", input: "contact", value: false });
    expect(h.sent).toEqual([]);
  });

  it("stores its start value so a read-on-init is answered, and can invert", () => {
    const h = contact({ invert: true, initiallyOpen: true });
    expect(h.objectValue("in", BINARY_INPUT_OBJECT)).toBe(false);
    h.press("in", "toggle");
    expect(h.sentFrom("in", BINARY_INPUT_OBJECT).map((t) => t.value)).toEqual([true]);
  });
});
