import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { benchSchema, loadBench, type Bench } from "@/engine";
import { checkBench } from "@/engine";
import { benchGraph } from "@/components/canvas/bench-graph";
import { addDevice, joinUnitLink, removeDevices, type EditResult } from "./index";
import { testBench } from "./test-bench";

function value<T>(result: EditResult<T>): T {
  if (!result.ok) throw new Error(`edit refused: ${result.error.message}`);
  return result.value;
}
function refusal<T>(result: EditResult<T>) {
  if (result.ok) throw new Error("expected the edit to be refused");
  return result.error;
}

const add = (bench: Bench, type: string) => value(addDevice(bench, { type })).bench;
const join = (bench: Bench, a: string, b: string) => value(joinUnitLink(bench, a, b));
/** Unit links as sets of members, order-free, to compare with the shipped bench. */
const shape = (bench: Bench) =>
  bench.unitLinks.map((u) => [...u.members].sort().join(" + ")).sort();

/** Two indoor units, each with its gateway (the front one with a wall controller), on one outdoor unit. */
function multiSplitByHand(): Bench {
  let bench = testBench();
  for (const type of [
    "hvac-gateway",
    "hvac-gateway",
    "indoor-unit",
    "indoor-unit",
    "wall-controller",
    "outdoor-unit",
  ])
    bench = add(bench, type);
  bench = join(bench, "hvac-gateway-1", "indoor-unit-1");
  bench = join(bench, "wall-controller-1", "indoor-unit-1");
  bench = join(bench, "hvac-gateway-2", "indoor-unit-2");
  // The drag the editor used to refuse or fold into the controller link:
  bench = join(bench, "outdoor-unit-1", "indoor-unit-1");
  bench = join(bench, "indoor-unit-2", "outdoor-unit-1");
  return bench;
}

// Common practice, no published source (knx-reference.md "Trade practice"): on a multi-split
// system several indoor units share one outdoor unit, and each keeps its own controllers.
describe("building a multi-split system in the editor", () => {
  it("puts each indoor unit on its controller link and on the outdoor unit's system link at once", () => {
    const bench = multiSplitByHand();
    expect(shape(bench)).toEqual([
      "hvac-gateway-1 + indoor-unit-1 + wall-controller-1",
      "hvac-gateway-2 + indoor-unit-2",
      "indoor-unit-1 + indoor-unit-2 + outdoor-unit-1",
    ]);
    const loaded = loadBench(bench);
    expect(loaded.ok ? [] : loaded.error).toEqual([]);
  });

  it("the canvas draws both links of each indoor unit", () => {
    const edges = benchGraph(multiSplitByHand()).edges.filter((e) => e.type === "unitLink");
    const touching = (id: string) =>
      new Set(
        edges
          .filter((e) => e.source === `d:${id}` || e.target === `d:${id}`)
          .map((e) => (e.data as { unitLink: string }).unitLink),
      ).size;
    expect(touching("indoor-unit-1")).toBe(2);
    expect(touching("indoor-unit-2")).toBe(2);
  });

  it("has the shape of the shipped Fernhill multi-split", () => {
    const shipped = benchSchema.parse(
      JSON.parse(
        readFileSync(
          new URL(
            "../../../scenarios/benches/fernhill-training-centre.bench.json",
            import.meta.url,
          ),
          "utf8",
        ),
      ),
    );
    const rename: Record<string, string> = {
      "gw-front": "hvac-gateway-1",
      "iu-front": "indoor-unit-1",
      "wc-front": "wall-controller-1",
      "gw-rear": "hvac-gateway-2",
      "iu-rear": "indoor-unit-2",
      "ou-lab": "outdoor-unit-1",
    };
    const shippedShape = shipped.unitLinks
      .map((u) =>
        u.members
          .map((m) => rename[m] ?? m)
          .sort()
          .join(" + "),
      )
      .sort();
    expect(shape(multiSplitByHand())).toEqual(shippedShape);
  });

  it("passes the per-unit HVAC checks once the gateways are set to multi-split and the controller secondary", () => {
    const bench = multiSplitByHand();
    const configured: Bench = {
      ...bench,
      devices: bench.devices.map((d) =>
        d.type === "hvac-gateway"
          ? { ...d, parameters: { systemType: "multi-split" } }
          : d.type === "wall-controller"
            ? { ...d, parameters: { role: "secondary" } }
            : d,
      ),
    };
    const hvac = checkBench(configured).filter((f) =>
      /^(indoor-unit|controller|gateway)\./.test(f.rule),
    );
    expect(hvac).toEqual([]);
  });

  it("refuses a second outdoor unit for one indoor unit, indoor units wired directly, and a gateway on an outdoor unit", () => {
    let bench = add(multiSplitByHand(), "outdoor-unit");
    expect(refusal(joinUnitLink(bench, "outdoor-unit-2", "indoor-unit-1")).message).toMatch(
      /already on another outdoor unit/,
    );
    expect(refusal(joinUnitLink(bench, "indoor-unit-1", "indoor-unit-2")).message).toMatch(
      /wire each of them to the outdoor unit/,
    );
    expect(refusal(joinUnitLink(bench, "outdoor-unit-1", "hvac-gateway-1")).message).toMatch(
      /piped to indoor units only/,
    );
    expect(refusal(joinUnitLink(bench, "outdoor-unit-1", "indoor-unit-2")).message).toMatch(
      /already on/,
    );
    bench = removeDevices(bench, ["indoor-unit-2"]);
    expect(shape(bench)).toEqual([
      "hvac-gateway-1 + indoor-unit-1 + wall-controller-1",
      "indoor-unit-1 + outdoor-unit-1",
    ]);
  });
});
