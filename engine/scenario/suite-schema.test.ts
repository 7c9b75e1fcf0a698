import { describe, expect, it } from "vitest";
import { parseSuite } from "./suite-schema";

describe("parseSuite", () => {
  it("accepts a named list of scenario files", () => {
    const result = parseSuite({
      format: 1,
      name: "Lab",
      scenarios: ["a.scenario.json", "b.scenario.json"],
    });
    expect(result).toEqual({
      ok: true,
      value: { format: 1, name: "Lab", scenarios: ["a.scenario.json", "b.scenario.json"] },
    });
  });

  it("points at a duplicate entry and at unknown fields", () => {
    const result = parseSuite({
      format: 1,
      name: "Lab",
      scenarios: ["a.json", "a.json"],
      tags: [],
    });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.error.issues).toEqual([
      { path: "tags", message: "unknown field" },
      { path: "scenarios[1]", message: "a.json is listed twice" },
    ]);
  });

  it("refuses an empty suite", () => {
    const result = parseSuite({ format: 1, name: "Lab", scenarios: [] });
    expect(result.ok ? "" : result.error.message).toBe(
      "scenarios: a suite lists at least one scenario",
    );
  });
});
