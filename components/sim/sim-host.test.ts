import { describe, expect, it } from "vitest";
import { recordScenario, type RecordedAction } from "@/engine";
import { scenarioSchema } from "@/engine";
import { SimHost } from "@/engine";
import { parseSimMessage, type LogRow, type SimCommand, type SimMessage } from "./sim-protocol";
import { createSimStore } from "./sim-store";
import { trainingRoomBench } from "@/test/harness/training-room-bench";

/** A host wired to a store through the real message validation, with a wall clock the test moves. */
function harness(options: { maxRowsPerBatch?: number; clockStepMs?: number } = {}) {
  let wallMs = 0;
  const messages: SimMessage[] = [];
  const store = createSimStore();
  const host = new SimHost({
    // Through structured clone and the page-side schema, as postMessage would.
    post: (message) => {
      const received = parseSimMessage(structuredClone(message));
      messages.push(received);
      store.getState().apply(received);
    },
    // A clock that creeps forward on every read, so a budgeted loop always ends.
    now: () => (wallMs += options.clockStepMs ?? 0),
    maxRowsPerBatch: options.maxRowsPerBatch,
  });
  const send = (command: SimCommand) => host.handle(command);
  send({ type: "load", bench: trainingRoomBench });
  return {
    host,
    store,
    messages,
    send,
    /** Moves the wall clock and ticks, as the worker's interval does. */
    tick(ms = 50, times = 1) {
      for (let i = 0; i < times; i++) {
        wallMs += ms;
        host.tick();
      }
    },
    rows(): LogRow[] {
      const log = store.getState().log;
      return Array.from({ length: log.length }, (_, i) => log.at(i));
    },
    errors: () => messages.filter((m) => m.type === "command-error"),
  };
}

describe("SimHost driven like the worker", () => {
  it("delivers 10,000 flooded telegrams at full speed to the store in capped batches", () => {
    const h = harness({ maxRowsPerBatch: 2_000, clockStepMs: 0.01 });
    h.send({ type: "flood", groupAddress: "1/0/1", count: 10_000, value: true });
    h.send({ type: "play", speed: "max" });
    const batchesBefore = h.messages.filter((m) => m.type === "batch").length;
    for (let i = 0; i < 400 && h.rows().filter((r) => r.source === "1.1.250").length < 10_000; i++)
      h.tick();

    const flood = h.rows().filter((r) => r.source === "1.1.250" && r.destination === "1/0/1");
    expect(flood).toHaveLength(10_000);
    // The light actuator listens on 1/0/1, so every write is acknowledged and none is repeated.
    expect(flood.every((r) => r.ack === "ack" && !r.repeated)).toBe(true);
    const batches = h.messages.filter((m) => m.type === "batch").slice(batchesBefore);
    const withRows = batches.filter((b) => b.rows.length > 0);
    expect(withRows.length).toBeGreaterThanOrEqual(5);
    expect(Math.max(...withRows.map((b) => b.rows.length))).toBeLessThanOrEqual(2_000);
    // One store update per batch: the log version moved once per batch with rows, not once per telegram.
    expect(h.store.getState().logVersion).toBeLessThan(withRows.length + 3);
    expect(h.store.getState().droppedRows).toBe(0);
    const seqs = h.rows().map((r) => r.seq);
    expect(seqs.every((seq, i) => i === 0 || seq > seqs[i - 1]!)).toBe(true);
  });

  it("maps virtual time to wall time at the chosen speed", () => {
    const h = harness();
    h.send({ type: "play", speed: 10 });
    h.tick(50);
    expect(h.store.getState().clock).toEqual({ nowUs: 500_000, running: true, speed: 10 });
    h.send({ type: "play", speed: 100 });
    h.tick(50);
    expect(h.store.getState().clock.nowUs).toBe(5_500_000);
    h.send({ type: "pause" });
    h.tick(50, 4);
    expect(h.store.getState().clock).toMatchObject({ nowUs: 5_500_000, running: false });
    h.send({ type: "jump", durationUs: 60_000_000 });
    h.tick(50);
    expect(h.store.getState().clock.nowUs).toBe(65_500_000);
    h.send({ type: "reset" });
    expect(h.store.getState().clock.nowUs).toBe(0);
  });

  it("logs a push-button telegram as the worked frame of the Basic course", () => {
    const h = harness();
    h.send({ type: "press", deviceId: "rocker", buttonId: "channel-1" });
    h.send({ type: "jump", durationUs: 1_000_000 });
    h.tick();
    const row = h.rows().find((r) => r.destination === "1/0/1")!;
    // knx-reference.md, TP1 standard frame: 1.1.1 writes ON to 1/0/1 at low priority -> BC 11 01 08 01 E1 00 81 3A
    expect(row).toMatchObject({
      source: "1.1.1",
      destinationName: "Ceiling light",
      service: "GroupValue_Write",
      value: "On",
      priority: "low",
      repeated: false,
      ack: "ack",
      rawHex: "BC 11 01 08 01 E1 00 81 3A",
    });
    const status = h.rows().find((r) => r.destination === "1/0/2")!;
    expect(status).toMatchObject({ source: "1.1.2", deviceId: "light", value: "On" });
    expect(h.store.getState().devices.light!.objects.find((o) => o.number === 1)!.value).toBe("On");
  });

  it("shows a power-on write in the log and the gateway's status object, with the transition name", () => {
    const h = harness();
    h.send({ type: "jump", durationUs: 5_000_000 });
    h.send({ type: "write", groupAddress: "2/0/0", value: true });
    h.send({ type: "jump", durationUs: 2_000_000 });
    h.tick();
    expect(
      h
        .rows()
        .some((r) => r.destination === "2/0/1" && r.deviceId === "gateway" && r.value === "On"),
    ).toBe(true);
    const gateway = h.store.getState().devices.gateway!;
    expect(gateway.objects.find((o) => o.number === 1)!.value).toBe("On");
    expect(gateway.transition).not.toBeNull();
    expect((h.store.getState().devices.unit!.state as { power: boolean }).power).toBe(true);
    expect(h.store.getState().charts.roomSamples("unit:unit").length).toBeGreaterThan(1);
  });

  it("raises the two-primaries fault when the wall controller is made primary too", () => {
    const h = harness();
    h.send({ type: "jump", durationUs: 5_000_000 });
    h.send({ type: "set-parameter", deviceId: "panel", key: "role", value: "primary" });
    h.send({ type: "jump", durationUs: 30_000_000 });
    h.tick();
    // common practice, no published source: one primary controller per indoor unit.
    expect(h.store.getState().faults.some((f) => f.fault === "link.two-primaries")).toBe(true);
    expect(
      h.rows().some((r) => r.kind === "fault" && r.value.startsWith("link.two-primaries")),
    ).toBe(true);
    expect(h.store.getState().bench!.devices.find((d) => d.id === "panel")!.role).toBe("primary");
  });

  it("records three actions into a scenario draft that the scenario schema accepts", () => {
    const h = harness();
    h.send({ type: "jump", durationUs: 5_000_000 });
    h.send({ type: "record", on: true });
    expect(h.store.getState().recording).toBe(true);
    h.send({ type: "write", groupAddress: "2/0/0", value: true });
    h.send({ type: "jump", durationUs: 2_000_000 });
    h.send({ type: "write", groupAddress: "2/0/2", value: 23.5 });
    h.send({ type: "jump", durationUs: 2_000_000 });
    h.send({ type: "press", deviceId: "rocker", buttonId: "channel-1" });
    h.send({ type: "jump", durationUs: 2_000_000 });
    h.send({ type: "record", on: false });
    const draft = h.store.getState().recordedDraft!;
    expect(draft.actions).toHaveLength(3);
    const scenario = recordScenario(draft.actions as RecordedAction[], {
      name: "Power, setpoint, light",
      bench: { name: "Console test room" },
      settleUs: draft.settleUs,
    });
    expect(scenarioSchema.safeParse(scenario).success).toBe(true);
    expect(
      scenario.steps
        .filter((s) => s.kind === "expect-value")
        .map((s) => (s as { groupAddress: string }).groupAddress),
    ).toEqual(expect.arrayContaining(["2/0/1", "2/0/3", "1/0/2"]));
  });

  it("dry-runs a scene: who changed to what, and which listener stayed silent", () => {
    const h = harness();
    h.send({ type: "jump", durationUs: 5_000_000 });
    h.send({ type: "scene-dry-run", groupAddress: "2/0/8", scene: 3, settleUs: 5_000_000 });
    const result = h.store.getState().sceneResult!;
    expect(result.changed.map((c) => c.deviceId)).toEqual(
      expect.arrayContaining(["gateway", "unit"]),
    );
    expect(result.changed.find((c) => c.deviceId === "gateway")!.changes).toContain(
      "Power status: Off → On",
    );
    expect(result.silent).toEqual([]);

    h.send({ type: "reset" });
    h.send({ type: "inject-fault", target: "gateway", faultId: "bus.silent" });
    h.send({ type: "scene-dry-run", groupAddress: "2/0/8", scene: 3, settleUs: 5_000_000 });
    expect(h.store.getState().sceneResult!.silent).toEqual([
      { deviceId: "gateway", name: "Unit gateway" },
    ]);
  });

  it("names the field of a bad command and of a refused request", () => {
    const h = harness();
    h.host.handle({ type: "play", speed: 5 });
    expect(h.errors().at(-1)).toMatchObject({ command: "play", field: "speed" });
    h.send({ type: "write", groupAddress: "7/7/7", value: true });
    expect(h.errors().at(-1)).toMatchObject({ command: "write", field: "groupAddress" });
    h.send({ type: "write", groupAddress: "2/0/2", value: "warm" });
    expect(h.errors().at(-1)).toMatchObject({ command: "write", field: "value" });
    h.send({ type: "press", deviceId: "rocker", buttonId: "nope" });
    expect(h.errors().at(-1)).toMatchObject({ command: "press", field: "buttonId" });
    expect(h.store.getState().lastError).toMatchObject({ command: "press", field: "buttonId" });
  });

  it("reports a bench that does not load with the path at fault", () => {
    const messages: SimMessage[] = [];
    const host = new SimHost({ post: (m) => messages.push(m), now: () => 0 });
    host.handle({
      type: "load",
      bench: { ...trainingRoomBench, devices: [{ id: "x", type: "no-such-type", name: "X" }] },
    });
    const failed = messages.find((m) => m.type === "load-failed");
    const paths = failed?.type === "load-failed" ? failed.errors.map((e) => e.path) : [];
    expect(paths.some((path) => path?.startsWith("devices[0]"))).toBe(true);
  });
});

describe("SimHost input commands", () => {
  it("keeps the bench the worker runs in the store, parameter changes included (what the live canvas draws)", () => {
    const h = harness();
    const gatewayOf = () =>
      h.store.getState().benchDocument?.devices.find((d) => d.id === "gateway");
    expect(gatewayOf()?.parameters).not.toMatchObject({ setpointMaxC: 26 });
    h.send({ type: "set-parameter", deviceId: "gateway", key: "setpointMaxC", value: 26 });
    expect(gatewayOf()?.parameters).toMatchObject({ setpointMaxC: 26 });
  });

  it("applies a simulation input and names the input's own field when it is refused", () => {
    const h = harness();
    h.send({ type: "input", input: { kind: "press", device: "rocker", button: "channel-1" } });
    h.send({ type: "input", input: { kind: "press", device: "rocker", button: "nope" } });
    h.host.handle({ type: "input", input: { kind: "press", device: "rocker" } }); // from an untyped page
    expect(h.errors().map((e) => e.type === "command-error" && [e.command, e.field])).toEqual([
      ["press", "button"],
      ["input", "input.button"],
    ]);
  });
});
