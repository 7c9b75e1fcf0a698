import { describe, expect, it } from "vitest";
import { benchBuilder } from "@/test/harness";
import { loadBench } from "./load-bench";
import { benchMigrations, migrateBench } from "./bench-migrations";

const twoLines = () => benchBuilder().mainLine("l11", "1.1").line("m1", "1.0");

describe("couplers in the bench loader", () => {
  // knx-reference.md, Topology: line coupler a.l.0, area coupler a.0.0.
  it("refuses a coupler whose address is not a.l.0 or a.0.0, naming the field", () => {
    const result = loadBench(twoLines().device("c", "coupler", "1.1.5").build());
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.error).toEqual([
      expect.objectContaining({
        kind: "bench.coupler-address",
        path: "devices[0].individualAddress",
        deviceId: "c",
      }),
    ]);
    expect(result.error[0]!.message).toMatch(/a line coupler is a\.l\.0/);
  });

  it("refuses a coupler whose line above is not on the bench", () => {
    const result = loadBench(
      benchBuilder().mainLine("l11", "1.1").device("c", "coupler", "1.1.0").build(),
    );
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.error[0]).toMatchObject({
      kind: "bench.coupler-line-missing",
      path: "devices[0].individualAddress",
    });
    expect(result.error[0]!.message).toContain("the line above, 1.0, is not in lines");
  });

  it("refuses a coupler placed on another line than its own", () => {
    const result = loadBench(
      twoLines().device("c", "coupler", "1.1.0", {}, { line: "m1" }).build(),
    );
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.error[0]).toMatchObject({ path: "devices[0].line" });
  });

  it("loads an area coupler between a main line and the backbone, on its own line", () => {
    const result = loadBench(
      benchBuilder()
        .mainLine("m1", "1.0")
        .line("bb", "0.0")
        .device("a", "coupler", "1.0.0")
        .build(),
    );
    expect(result.ok).toBe(true);
    if (result.ok) expect(result.value.deviceById.get("a")?.line).toBe("m1");
  });

  it("refuses a filter table entry that is not a group address", () => {
    const result = loadBench(
      twoLines()
        .device("c", "coupler", "1.1.0", { filterTable: ["1/2/3", "nope"] })
        .build(),
    );
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.error[0]!.path).toBe("devices[0].parameters.filterTable[1]");
  });
});

describe("bench format 2", () => {
  it("brings a format-1 bench forward unchanged but for its number", () => {
    const v1 = { ...twoLines().device("c", "coupler", "1.1.0").build(), format: 1 };
    const migrated = migrateBench(v1, benchMigrations, 2);
    expect(migrated.ok && migrated.value).toEqual({ ...v1, format: 2 });
    const loaded = loadBench(v1);
    expect(loaded.ok && loaded.value.bench.format).toBe(2);
  });
});
