import { describe, expect, it } from "vitest";
import { checkDptValue, defaultDptValue, editorFor } from "./dpt-value";

describe("editorFor", () => {
  it("gives each DPT family the editor made for it", () => {
    // DPT spec §4.2 (knx-reference.md): 1.100 is 0 = cooling, 1 = heating.
    expect(editorFor("1.100")).toMatchObject({ kind: "switch" });
    expect(editorFor("5.001")).toEqual({ kind: "percent" });
    expect(editorFor("9.001")).toMatchObject({ kind: "number", unit: "°C", step: 0.1 });
    expect(editorFor("17.001")).toEqual({ kind: "scene" });
    expect(editorFor("16.000")).toEqual({ kind: "text", maxLength: 14 });
    // DPT spec (knx-reference.md): 20.105 has 0 auto, 1 heat, 3 cool, 6 off, 9 fan only.
    const mode = editorFor("20.105");
    expect(mode.kind === "mode" && mode.options.map((o) => o.value)).toEqual(
      expect.arrayContaining([0, 1, 3, 6, 9]),
    );
  });

  it("starts every editor on a value its DPT accepts", () => {
    for (const dpt of [
      "1.001",
      "1.019",
      "5.001",
      "5.100",
      "9.001",
      "17.001",
      "18.001",
      "20.105",
      "16.000",
    ]) {
      expect(checkDptValue(dpt, defaultDptValue(dpt))).toEqual({ ok: true });
    }
    expect(checkDptValue("17.001", 65)).toMatchObject({ ok: false });
  });
});
