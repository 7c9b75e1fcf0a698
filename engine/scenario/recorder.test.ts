import { describe, expect, it } from "vitest";
import { parseScenario } from "./parse-scenario";
import { benchBuilder } from "@/test/harness";
import { lightsFixture } from "../../test/harness/fixture-benches";
import { createSimulation } from "../sim";
import { TraceRecorder, recordScenario, replyWindowUs, type RecordedAction } from "./recorder";

describe("recordScenario", () => {
  const actions: RecordedAction[] = [
    {
      action: { kind: "write", atUs: 1_000_000, groupAddress: "2/0/2", value: 23.5 },
      observed: [
        // The console's own write is the action itself, not a reply.
        { atUs: 1_000_000, groupAddress: "2/0/2", service: "write", value: 23.5 },
        {
          atUs: 1_080_000,
          groupAddress: "2/1/2",
          service: "write",
          value: 23.5,
          device: "gw-front",
        },
        {
          atUs: 1_090_000,
          groupAddress: "2/1/2",
          service: "write",
          value: 23.5,
          device: "gw-front",
        },
      ],
    },
    {
      action: { kind: "read", atUs: 31_000_000, groupAddress: "2/1/1" },
      observed: [
        { atUs: 31_000_000, groupAddress: "2/1/1", service: "read" },
        {
          atUs: 31_050_000,
          groupAddress: "2/1/1",
          service: "response",
          value: false,
          device: "gw-front",
        },
      ],
    },
    {
      action: { kind: "press", atUs: 32_000_000, device: "pb-door", button: "channel-1" },
      observed: [],
    },
  ];

  it("replays the actions with waits between them and expects each first reply", () => {
    const draft = recordScenario(actions, {
      name: "Recorded",
      bench: { path: "../benches/lab.bench.json" },
    });
    expect(draft.settle).toBe("1s");
    expect(draft.steps).toEqual([
      { kind: "write", groupAddress: "2/0/2", value: 23.5 },
      { kind: "expect-value", groupAddress: "2/1/2", value: 23.5, within: "500ms" },
      { kind: "wait", for: "30s" },
      { kind: "read", groupAddress: "2/1/1" },
      { kind: "expect-response", groupAddress: "2/1/1", value: false, within: "500ms" },
      { kind: "wait", for: "1s" },
      { kind: "press", device: "pb-door", button: "channel-1" },
    ]);
  });

  it("produces a document the scenario schema accepts", () => {
    const draft = recordScenario(actions, {
      name: "Recorded",
      bench: { name: "Fernhill Training Centre" },
      seed: 4,
    });
    const parsed = parseScenario(draft);
    expect(parsed.ok).toBe(true);
  });

  it("rounds reply windows up to readable durations with room to spare", () => {
    expect(replyWindowUs(80_000)).toBe(500_000);
    expect(replyWindowUs(400_000)).toBe(1_000_000);
    expect(replyWindowUs(25_000_000)).toBe(60_000_000);
    expect(replyWindowUs(3_000_000_000)).toBe(4_500_000_000);
  });
});

describe("TraceRecorder", () => {
  it("turns the trace's user actions and the telegrams after them into recorded actions", () => {
    const bench = lightsFixture().build();
    const sim = createSimulation(bench, { seed: 1 });
    const recorder = new TraceRecorder((raw) => sim.bench.groupAddresses.get(raw)?.dpt);
    sim.subscribe((event) => recorder.onEvent(event));
    sim.runFor(1_000_000);
    expect(sim.apply({ kind: "write", groupAddress: "1/0/1", value: true }).ok).toBe(true);
    sim.runFor(1_000_000);
    const [recorded] = recorder.actions();
    expect(recorded?.action).toEqual({
      kind: "write",
      groupAddress: "1/0/1",
      value: true,
      atUs: 1_000_000,
    });
    expect(recorded?.observed[0]).toMatchObject({ groupAddress: "1/0/1", service: "write" });
  });

  it("observes a telegram once, not again where a coupler passes it to another line", () => {
    const bench = benchBuilder()
      .mainLine("l11", "1.1")
      .line("m1", "1.0")
      .groupAddress("1/0/1", "1.001")
      .device("c11", "coupler", "1.1.0")
      .device("pb", "push-button", "1.1.1")
      .device("act", "switch-actuator", "1.0.1")
      .link("pb", 0, "1/0/1")
      .link("act", 0, "1/0/1")
      .build();
    const sim = createSimulation(bench, { seed: 1 });
    const recorder = new TraceRecorder((raw) => sim.bench.groupAddresses.get(raw)?.dpt);
    sim.subscribe((event) => recorder.onEvent(event));
    expect(sim.pressButton("pb", "channel-1").ok).toBe(true);
    sim.runFor(1_000_000);
    expect(sim.line("m1").telegramsTotal).toBe(1);
    expect(recorder.actions()[0]?.observed).toHaveLength(1);
  });
});
