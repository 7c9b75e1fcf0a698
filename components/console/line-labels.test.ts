import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { lineLabels } from "./line-labels";

describe("lineLabels", () => {
  it("labels the demo bench's line with its number and name", () => {
    const bench: unknown = JSON.parse(
      readFileSync("scenarios/benches/fernhill-training-centre.bench.json", "utf8"),
    );
    expect(lineLabels(bench).get("line-lab")).toBe("1.1 Lab room line");
  });

  it("gives no labels for a document without lines", () => {
    expect(lineLabels(null).size).toBe(0);
    expect(lineLabels({ lines: "none" }).size).toBe(0);
  });
});
