import { describe, expect, it } from "vitest";
import { benchSchema, type Bench, type BenchInput } from "../bench/bench-schema";
import "../devices";
import { getDpt } from "../dpt";
import { checkBench } from "./check-bench";
import { explainMeaningChange } from "./dpt-meaning";

function bench(input: Partial<BenchInput>): Bench {
  return benchSchema.parse({
    format: 1,
    name: "fixture",
    lines: [{ id: "line-1", address: "1.1", name: "Line 1" }],
    testToolAddress: "1.1.250",
    ...input,
  });
}

const codec = (id: string) => getDpt(id)!;

/** A panel with one value tile sending `value` as `dpt` on 2/0/1, and a gateway listening there. */
function panelOnGateway(
  dpt: string,
  value: number | boolean,
  gatewayObject: number,
  gateway: Record<string, unknown> = {},
  kind = "value",
): Bench {
  return bench({
    devices: [
      {
        id: "panel",
        type: "control-panel",
        name: "Panel",
        individualAddress: "1.1.10",
        parameters: { tiles: [{ label: "Preset", dpt, kind, value }] },
      },
      {
        id: "gw",
        type: "hvac-gateway",
        name: "Gateway",
        individualAddress: "1.1.20",
        parameters: gateway,
      },
    ],
    links: [
      { device: "panel", object: 0, groupAddress: "2/0/1" },
      { device: "gw", object: gatewayObject, groupAddress: "2/0/1" },
    ],
  });
}

const rule = (b: Bench, id: string) => checkBench(b, { rules: [id] });

describe("address.dpt-meaning: same size, different meaning", () => {
  it("explains 20.102 read as 20.105 from the value tables", () => {
    // DPT spec §4 (20.102: 1 comfort, 2 standby, 3 economy, 4 building protection;
    // 20.105: 1 heat, 2 morning warmup, 3 cool, 4 night purge), knx-reference.md.
    expect(explainMeaningChange(codec("20.102"), codec("20.105"))).toEqual([
      "Comfort (1) will arrive as Heat",
      "Standby (2) will arrive as Morning warmup",
      "Economy (3) will arrive as Cool",
      "Building protection (4) will arrive as Night purge",
    ]);
  });

  it("explains 20.105 read as 20.102, refusing codes 20.102 does not have", () => {
    const effects = explainMeaningChange(codec("20.105"), codec("20.102"));
    expect(effects).toContain("Cool (3) will arrive as Economy");
    // DPT spec §4: 20.102 stops at 4; 6 (Off on 20.105) is reserved there.
    expect(effects.find((e) => e.startsWith("Off (6)"))).toMatch(/will be refused/);
  });

  it("explains percentage, counter and fan stage on one octet", () => {
    // DPT spec §3.5: 50 % travels as 0x80 (128); 5.010 reads the raw octet as a count.
    expect(explainMeaningChange(codec("5.001"), codec("5.010"))).toContain(
      "50 % will arrive as 128 pulses",
    );
    // 5.100 level 3 is raw 3, which 5.001 reads as 3 · 100 / 255 = 1.2 % (DPT spec §3.5).
    expect(explainMeaningChange(codec("5.100"), codec("5.001"))).toContain(
      "3 will arrive as 1.2 %",
    );
  });

  it("explains 1.001 read as 1.100 and 9.001 read as 9.002", () => {
    // DPT spec §4.2: 1.100 0 = cooling, 1 = heating; §3.1: 1.001 0 off, 1 on.
    expect(explainMeaningChange(codec("1.001"), codec("1.100"))).toEqual([
      "Off will arrive as Cooling",
      "On will arrive as Heating",
    ]);
    // DPT spec §3.10: same float, 9.001 in °C, 9.002 a difference in K.
    expect(explainMeaningChange(codec("9.001"), codec("9.002"))).toEqual([
      "21.00 °C will arrive as 21.00 K",
    ]);
  });

  it("fails: a 20.102 sender on the gateway's 20.105 mode object, as an error naming the effect", () => {
    const findings = rule(panelOnGateway("20.102", 3, 4), "address.dpt-meaning");
    expect(findings).toEqual([
      expect.objectContaining({
        severity: "error",
        location: { groupAddress: "2/0/1", device: "gw", object: 4 },
      }),
    ]);
    expect(findings[0]!.message).toContain("Economy (3) will arrive as Cool");
  });

  it("warns: a 1.001 switch on a 1.100 heat/cool object (often wanted, still worth a look)", () => {
    const b = panelOnGateway("1.001", true, 6, { modeControl: "simplified" }, "toggle");
    expect(rule(b, "address.dpt-meaning")).toEqual([
      expect.objectContaining({ severity: "warning" }),
    ]);
  });

  it("passes: a 20.105 sender on the 20.105 mode object", () => {
    expect(rule(panelOnGateway("20.105", 3, 4), "address.dpt-meaning")).toEqual([]);
  });
});

describe("panel.preset-out-of-range", () => {
  it("fails: a 35 °C preset on a gateway limited to 16..30 °C, and fan level 5 on 3 levels", () => {
    // Common practice, no published source: a controller clamps a setpoint to its limits.
    const setpoint = rule(panelOnGateway("9.001", 35, 2), "panel.preset-out-of-range");
    expect(setpoint).toEqual([
      expect.objectContaining({
        severity: "warning",
        location: { device: "panel", object: 0, parameter: "tiles.0.value" },
      }),
    ]);
    expect(setpoint[0]!.message).toContain("16..30 °C");
    expect(rule(panelOnGateway("5.100", 5, 8), "panel.preset-out-of-range")).toHaveLength(1);
    expect(
      rule(panelOnGateway("5.100", 0, 8, { fanAuto: false }), "panel.preset-out-of-range"),
    ).toHaveLength(1);
    expect(
      rule(panelOnGateway("5.010", 4, 8, { fanEncoding: "counter" }), "panel.preset-out-of-range"),
    ).toHaveLength(1);
    expect(
      rule(panelOnGateway("5.100", 0, 8, { fanAutoObject: true }), "panel.preset-out-of-range"),
    ).toHaveLength(1);
  });
  it("passes: 22 °C and fan level 2", () => {
    expect(rule(panelOnGateway("9.001", 22, 2), "panel.preset-out-of-range")).toEqual([]);
    expect(rule(panelOnGateway("5.100", 2, 8), "panel.preset-out-of-range")).toEqual([]);
  });
});

describe("reads and status addresses", () => {
  /** Two gateways: A's setpoint status sends on `statusTo`; B's setpoint command listens on 2/0/1. */
  function twoGateways(statusTo: string, extra: BenchInput["links"] = []): Bench {
    return bench({
      devices: [
        { id: "gw-a", type: "hvac-gateway", name: "A", individualAddress: "1.1.20" },
        { id: "gw-b", type: "hvac-gateway", name: "B", individualAddress: "1.1.21" },
      ],
      links: [
        { device: "gw-a", object: 2, groupAddress: "2/0/1" },
        { device: "gw-b", object: 2, groupAddress: "2/0/1" },
        { device: "gw-a", object: 3, groupAddress: statusTo },
        ...extra,
      ],
    });
  }

  it("object.status-on-command-address fails: a setpoint status sending on the setpoint command address", () => {
    // Common practice, no published source: a command and its status travel on separate addresses.
    expect(rule(twoGateways("2/0/1"), "object.status-on-command-address")).toEqual([
      expect.objectContaining({
        severity: "warning",
        location: { device: "gw-a", object: 3, groupAddress: "2/0/1" },
      }),
    ]);
    expect(rule(twoGateways("2/0/2"), "object.status-on-command-address")).toEqual([]);
  });

  it("address.several-read-responders fails: two status objects with the read flag on one address", () => {
    // Common practice, no published source: one object per address answers reads.
    const b = twoGateways("2/0/2", [{ device: "gw-b", object: 3, groupAddress: "2/0/2" }]);
    expect(rule(b, "address.several-read-responders")).toEqual([
      expect.objectContaining({ severity: "warning", location: { groupAddress: "2/0/2" } }),
    ]);
    expect(rule(twoGateways("2/0/2"), "address.several-read-responders")).toEqual([]);
  });

  it("object.read-on-init-unanswered fails: an external temperature input nobody answers", () => {
    // The gateway's external temperature input (object 13) reads at start-up (flag I).
    const unanswered = bench({
      devices: [
        {
          id: "gw",
          type: "hvac-gateway",
          name: "Gateway",
          individualAddress: "1.1.20",
          parameters: { roomTemperatureSource: "external" },
        },
      ],
      links: [{ device: "gw", object: 13, groupAddress: "3/0/1" }],
    });
    expect(rule(unanswered, "object.read-on-init-unanswered")).toEqual([
      expect.objectContaining({
        severity: "warning",
        location: { device: "gw", object: 13, groupAddress: "3/0/1" },
      }),
    ]);
    const answered = bench({
      ...unanswered,
      devices: [
        ...unanswered.devices,
        { id: "ts", type: "room-temperature-sensor", name: "Sensor", individualAddress: "1.1.30" },
      ],
      links: [...unanswered.links, { device: "ts", object: 0, groupAddress: "3/0/1" }],
    });
    expect(rule(answered, "object.read-on-init-unanswered")).toEqual([]);
  });
});

describe("address.dpt-meaning grading of 1-bit pairs", () => {
  it("occupancy (1.018) switching a light (1.001) is info only", () => {
    // DPT spec §3.1: 1.018 0 not occupied, 1 occupied; 1.001 0 off, 1 on.
    const b = bench({
      devices: [
        { id: "pd", type: "presence-detector", name: "Presence", individualAddress: "1.1.5" },
        { id: "act", type: "switch-actuator", name: "Lights", individualAddress: "1.1.6" },
      ],
      links: [
        { device: "pd", object: 0, groupAddress: "4/1/3" },
        { device: "act", object: 0, groupAddress: "4/1/3" },
      ],
    });
    expect(rule(b, "address.dpt-meaning").map((f) => f.severity)).toEqual(["info"]);
  });
});

describe("the night economy exercise bench", () => {
  it("hides exactly one DPT-meaning mistake, which the check explains", async () => {
    const { readFileSync } = await import("node:fs");
    const doc: unknown = JSON.parse(
      readFileSync(
        new URL("../../scenarios/exercises/night-economy.bench.json", import.meta.url),
        "utf8",
      ),
    );
    const errors = checkBench(benchSchema.parse(doc)).filter((f) => f.severity === "error");
    // DPT spec §4: 20.102 3 = Economy; 20.105 3 = Cool.
    // Both ways on the one address: the gateway reads the tile's Economy as Cool, and the
    // tile (which listens too) reads the trainer panel's Cool as Economy.
    expect(errors.map((f) => [f.rule, f.location.groupAddress])).toEqual([
      ["address.dpt-meaning", "2/0/3"],
      ["address.dpt-meaning", "2/0/3"],
    ]);
    expect(errors.map((f) => f.message).join("\n")).toContain("Economy (3) will arrive as Cool");
  });

  it("fails as its brief expects: the heating unit is turned to cooling", async () => {
    const { readFileSync } = await import("node:fs");
    const { parseScenario } = await import("../scenario/parse-scenario");
    const { runSuite } = await import("../scenario/run-suite");
    const read = (name: string): unknown =>
      JSON.parse(
        readFileSync(new URL(`../../scenarios/exercises/${name}`, import.meta.url), "utf8"),
      );
    const parsed = parseScenario(read("night-economy.scenario.json"));
    if (!parsed.ok) throw new Error(parsed.error.message);
    const result = runSuite("exercise", [
      {
        source: "night-economy.scenario.json",
        scenario: parsed.value,
        bench: read("night-economy.bench.json") as never,
      },
    ]);
    expect(result.scenarios.map((s) => s.outcome)).toEqual(["expected-failure"]);
  });
});
