import { beforeAll, describe, expect, it } from "vitest";
import { benchBuilder, registerTestDevices, SimHarness, type RecorderState } from "@/test/harness";
import { bitTimesToUs, frameDurationUs } from "../frame";
import {
  BUS_FAULTS,
  UNIT_LINK_BROKEN,
  UNIT_LINK_DELAY_US,
  createSimulation,
  tryCreateSimulation,
} from "./index";
import type { TraceEvent } from "../core/trace";

beforeAll(registerTestDevices);

// TP1 timing from knx-reference.md ("TP1 timing"; Basic course, TP1 conformance §10.1.2).
const IDLE_US = bitTimesToUs(50); // idle before a frame
const ACK_SLOT_US = bitTimesToUs(15 + 11); // gap + acknowledgement character
const BUSY_WAIT_US = bitTimesToUs(150); // wait after BUSY
const SHORT_FRAME_US = frameDurationUs(9); // 9-octet 1-bit write, 13 bit times per octet

function sent(events: readonly TraceEvent[]) {
  return events.filter(
    (e): e is Extract<TraceEvent, { kind: "telegram.sent" }> => e.kind === "telegram.sent",
  );
}

/**
 * A push-button toggling a switch actuator, with the actuator's status fed back to the rocker.
 * The actuator's start-up status (after bus power returns) comes after these tests' window;
 * start-up has tests of its own ("start-up after bus power returns").
 */
function lightBench(startupDelayS = 600) {
  return benchBuilder()
    .groupAddress("1/0/1", "1.001", "Hall light")
    .groupAddress("1/0/2", "1.001", "Hall light status")
    .device("pb", "push-button", "1.1.1")
    .device("act", "switch-actuator", "1.1.2", { startupDelayS })
    .link("pb", 0, "1/0/1", "1/0/2")
    .link("act", 0, "1/0/1")
    .link("act", 1, "1/0/2")
    .build();
}

// Two recorders r1 (1.1.11) and r2 (1.1.12) both listening to the 7.001 address 1/1/1.
function twoListenersBench() {
  return benchBuilder()
    .groupAddress("1/1/1", "7.001")
    .device("r1", "test-recorder", "1.1.11")
    .device("r2", "test-recorder", "1.1.12")
    .link("r1", 0, "1/1/1")
    .link("r2", 0, "1/1/1")
    .build();
}

describe("push-button and switch actuator on a line", () => {
  it("toggles the relay from the rocker and keeps the rocker in step through the status", () => {
    const h = SimHarness.create(lightBench());
    h.press("pb", "channel-1")
      .settle()
      .expectState("act", { on: [true] })
      .expectGroupValue("1/0/2", true)
      .expectObjectValue("pb", 0, true);
    h.press("pb", "channel-1")
      .settle()
      .expectState("act", { on: [false] })
      .expectGroupValue("1/0/2", false);
    // Each press: the rocker's write and the actuator's status.
    h.expectCount(4).expectCount(2, { address: "1/0/2" });
  });

  it("keeps the rocker in step when the light is switched from elsewhere (second listening address)", () => {
    const h = SimHarness.create(lightBench());
    h.write("1/0/1", true).settle().expectObjectValue("pb", 0, true);
    // The next press therefore switches off rather than on again.
    h.press("pb", "channel-1")
      .settle()
      .expectState("act", { on: [false] });
  });

  it("answers a read of the status from the stored value, and the rocker takes the response (update flag)", () => {
    const h = SimHarness.create(lightBench());
    h.write("1/0/1", true).settle();
    h.sim.setParameter("pb", "channels", [{ function: "toggle" }]); // restart clears the rocker's object
    h.settle().expectObjectValue("pb", 0, undefined);
    h.read("1/0/2").settle();
    const responses = h
      .events({ kinds: ["telegram.sent"], address: "1/0/2" })
      .filter((e) => "service" in e && e.service === "GroupValue_Response");
    expect(responses).toHaveLength(1);
    expect(responses[0]).toMatchObject({ deviceId: "act", payloadHex: "01" });
    h.expectObjectValue("pb", 0, true);
  });

  it("ignores a write to an object without the write flag and a response without the update flag", () => {
    const h = SimHarness.create(lightBench());
    // The status object is C R T: a write to 1/0/2 does not change it.
    h.write("1/0/2", true).settle().expectObjectValue("act", 1, false);
    // The switch object is C W: a response on 1/0/1 does not switch the relay.
    unwrap(h.sim.sendGroupResponse("1/0/1", true));
    h.settle().expectState("act", { on: [false] });
  });

  it("turns the light off after the staircase time (device timers on the virtual clock)", () => {
    const bench = lightBench();
    bench.devices![1]!.parameters = { staircaseS: 30 };
    const h = SimHarness.create(bench);
    h.write("1/0/1", true)
      .runFor("29s")
      .expectState("act", { on: [true] });
    h.write("1/0/1", true)
      .runFor("29s")
      .expectState("act", { on: [true] }); // restarted
    h.runFor("2s")
      .expectState("act", { on: [false] })
      .expectGroupValue("1/0/2", false);
    h.expectCount(1, { kinds: ["timer.fired"] });
  });
});

describe("TP1 timing", () => {
  it("starts a frame after 50 idle bit times and spaces acknowledged telegrams 193 bit times apart", () => {
    const h = SimHarness.create(lightBench());
    h.write("1/0/1", true).write("1/0/1", false).settle();
    // After each write the actuator's status wins the next slot; every start is 193 bit times after the last.
    const frames = sent(h.trace);
    expect(frames.map((f) => f.deviceId ?? "test-tool")).toEqual([
      "test-tool",
      "act",
      "test-tool",
      "act",
    ]);
    // Basic course: idle 50 + 9 × 13 + 15 + 11 = 193 bit times per acknowledged short telegram.
    expect(frames[0]!.timeUs).toBe(IDLE_US);
    expect(frames[0]!.endUs - frames[0]!.timeUs).toBe(SHORT_FRAME_US);
    for (let i = 1; i < frames.length; i++)
      expect(frames[i]!.timeUs - frames[i - 1]!.timeUs).toBe(bitTimesToUs(193));
  });

  it("repeats an unacknowledged frame three times with the repeat flag, then gives up", () => {
    const h = SimHarness.create(benchBuilder().groupAddress("1/0/9", "1.001").build());
    h.write("1/0/9", true).settle();
    const frames = sent(h.trace);
    // knx-reference.md: no acknowledgement -> up to 3 repetitions with R = 0.
    expect(frames.map((f) => [f.attempt, f.repeated])).toEqual([
      [0, false],
      [1, true],
      [2, true],
      [3, true],
    ]);
    // A silent acknowledgement slot counts toward the next 50 idle bit times.
    expect(frames[1]!.timeUs - frames[0]!.endUs).toBe(IDLE_US);
    expect(h.events({ kinds: ["telegram.lost"] })).toEqual([
      expect.objectContaining({ reason: "none", attempt: 3 }),
    ]);
  });

  it("waits 150 bit times after BUSY, and the busy listener takes the repetition once it is ready", () => {
    const h = SimHarness.create(lightBench());
    h.injectFault("act", BUS_FAULTS.busy)
      .write("1/0/1", true)
      .runFor(IDLE_US + SHORT_FRAME_US + ACK_SLOT_US);
    h.expectCount(1, { kinds: ["telegram.repeated"] }).expectState("act", { on: [false] });
    h.clearFault("act", BUS_FAULTS.busy).settle();
    const frames = sent(h.trace).filter((f) => f.destination === 0x0801);
    expect(frames.map((f) => f.attempt)).toEqual([0, 1]);
    // knx-reference.md: after BUSY the sender waits at least 150 bit times.
    expect(frames[1]!.timeUs - (frames[0]!.endUs + ACK_SLOT_US)).toBe(BUSY_WAIT_US);
    h.expectState("act", { on: [true] });
  });

  it("repeats after NAK and counts the telegram once in the statistics", () => {
    const h = SimHarness.create(lightBench());
    h.injectFault("act", BUS_FAULTS.nak).write("1/0/1", true).runUntil("1s");
    expect(
      h.events({ kinds: ["telegram.repeated"] }).map((e) => "reason" in e && e.reason),
    ).toEqual(["nak", "nak", "nak"]);
    h.expectCount(1, { kinds: ["telegram.lost"] });
    const stats = h.sim.busStats(1_000_000);
    expect([stats.telegrams, stats.transmissions, stats.repetitions]).toEqual([1, 4, 3]);
  });

  it("lets a listener that already took the frame ignore the repetition", () => {
    const h = SimHarness.create(twoListenersBench());
    h.injectFault("r2", BUS_FAULTS.busy)
      .write("1/1/1", 7)
      .runFor("25ms")
      .clearFault("r2", BUS_FAULTS.busy)
      .settle();
    expect(sent(h.trace)).toHaveLength(2);
    expect((h.sim.deviceState("r1") as RecorderState).writes).toEqual([7]);
    expect((h.sim.deviceState("r2") as RecorderState).writes).toEqual([7]);
  });

  it("regression (fast-check seed -1049800968): ignores a repetition even when another telegram passed in between", () => {
    // r1 is BUSY, so the test tool's write is repeated; r1's own telegram goes on the line
    // between the first transmission and the repetition. r2 took the first transmission and
    // must not take the repetition again.
    const h = SimHarness.create(twoListenersBench());
    h.injectFault("r1", BUS_FAULTS.busy)
      .input("r1", "send", 5)
      .write("1/1/1", 10_000, { priority: "system" })
      .settle();
    expect(sent(h.trace).map((f) => f.deviceId ?? "test-tool")).toEqual([
      "test-tool",
      "r1",
      "test-tool",
      "test-tool",
      "test-tool",
    ]);
    expect((h.sim.deviceState("r2") as RecorderState).writes).toEqual([10_000, 5]);
  });

  it("gives the line to the higher priority when two senders start together", () => {
    const h = SimHarness.create(lightBench());
    h.write("1/0/1", true, { from: "pb", priority: "low" })
      .write("1/0/2", true, { from: "act", priority: "urgent" })
      .settle();
    // knx-reference.md: lower priority code wins; urgent (10) beats low (11).
    // (The third frame is the actuator's status after the write switched it.)
    const frames = sent(h.trace);
    expect(frames.map((f) => f.priority).slice(0, 2)).toEqual(["urgent", "low"]);
    expect(frames[0]!.arbitrationLosers).toBe(1);
  });

  it("settles equal priorities bit by bit on the source address, least significant bit first", () => {
    // 1.1.1 = 0x1101 and 1.1.2 = 0x1102 differ first in bit 0 of the low octet: 1 vs 0.
    // A logical 0 dominates (knx-reference.md), and a character goes LSB first (UART order,
    // recalled from memory), so 1.1.2 wins although its address is the higher number.
    const h = SimHarness.create(lightBench());
    h.write("1/0/1", true, { from: "pb" }).write("1/0/2", true, { from: "act" }).settle();
    expect(
      sent(h.trace)
        .map((f) => f.deviceId)
        .slice(0, 2),
    ).toEqual(["act", "pb"]);
  });
});

describe("unit links, faults and parameters", () => {
  function linkBench() {
    return benchBuilder()
      .groupAddress("1/1/1", "7.001")
      .device("a", "test-recorder", "1.1.11")
      .device("b", "test-link-recorder", undefined)
      .device("c", "test-link-recorder", undefined)
      .unitLink("wiring", "a", "b", "c")
      .build();
  }

  it("delivers unit-link messages to the other members after the fixed delay", () => {
    const h = SimHarness.create(linkBench());
    h.input("a", "link", { link: "wiring", message: { hello: 1 } }).runFor(UNIT_LINK_DELAY_US - 1);
    expect((h.sim.deviceState("b") as RecorderState).received).toEqual(["start"]);
    h.runFor(1);
    expect((h.sim.deviceState("b") as RecorderState).received).toEqual([
      "start",
      'link.receive:a:{"hello":1}',
    ]);
    expect((h.sim.deviceState("c") as RecorderState).received).toHaveLength(2);
    expect((h.sim.deviceState("a") as RecorderState).received).toEqual(["start", "input"]);
  });

  it("drops messages on a broken link, including ones already on their way", () => {
    const h = SimHarness.create(linkBench());
    h.input("a", "link", { link: "wiring", message: 1 })
      .runFor("5ms")
      .injectFault("wiring", UNIT_LINK_BROKEN)
      .settle();
    h.input("a", "link", { link: "wiring", message: 2 }).settle();
    h.expectCount(4, { kinds: ["link.dropped"] }).expectFault("wiring", UNIT_LINK_BROKEN);
    h.clearFault("wiring", UNIT_LINK_BROKEN)
      .input("a", "link", { link: "wiring", message: 3 })
      .settle();
    h.expectCount(2, { kinds: ["link.delivered"] });
    expect(h.sim.injectFault("wiring", "link.noise")).toMatchObject({
      ok: false,
      error: { kind: "sim.fault-unknown", field: "fault" },
    });
  });

  it("hands injected faults to the device and keeps faults the device raised", () => {
    const h = SimHarness.create(linkBench());
    h.injectFault("a", "unit.sensor-open").input("a", "raise", "unit.self-test").settle();
    expect((h.sim.deviceState("a") as RecorderState).received).toContain(
      "fault.inject:unit.sensor-open",
    );
    expect(h.sim.activeFaults("a")).toEqual(["unit.sensor-open", "unit.self-test"]);
    h.clearFault("a", "unit.sensor-open").input("a", "clear", "unit.self-test");
    expect(h.sim.activeFaults("a")).toEqual([]);
    expect(h.events({ kinds: ["fault."] }).map((e) => e.kind)).toEqual([
      "fault.raised",
      "fault.raised",
      "fault.cleared",
      "fault.cleared",
    ]);
  });

  it("replaces a timer set again under the same name and forgets a cancelled one", () => {
    const h = SimHarness.create(linkBench());
    h.input("a", "timer", { name: "t", delayUs: 1000 })
      .input("a", "timer", { name: "t", delayUs: 5000 })
      .input("a", "timer", { name: "u", delayUs: 10 });
    h.input("a", "cancel", "u").settle();
    expect(h.events({ kinds: ["timer.fired"] })).toEqual([
      { kind: "timer.fired", timeUs: 5000, deviceId: "a", name: "t" },
    ]);
  });

  it("reads objects with the read-on-init flag at start", () => {
    const bench = lightBench();
    bench.devices![0]!.objectFlags = { "0": { readOnInit: true } };
    const h = SimHarness.create(bench).settle();
    // The rocker reads 1/0/1 (its sending address); nobody has the read flag there, so no answer.
    h.expectCount(1, { address: "1/0/1" });
    expect(sent(h.trace)[0]).toMatchObject({
      service: "GroupValue_Read",
      deviceId: "pb",
      timeUs: IDLE_US,
    });
  });

  it("re-derives objects and restarts a device when a parameter changes", () => {
    const h = SimHarness.create(lightBench());
    h.write("1/0/1", true)
      .settle()
      .expectState("act", { on: [true] });
    h.setParameter("act", "channels", 2)
      .settle()
      .expectState("act", { on: [false, false] });
    expect(h.sim.bench.deviceById.get("act")!.objects.map((o) => o.number)).toEqual([0, 1, 2, 3]);
    h.setParameter("act", "statusObjects", false);
    // The status object is gone, and with it the link to 1/0/2.
    expect(h.sim.bench.bench.links.filter((l) => l.device === "act")).toEqual([
      { device: "act", object: 0, groupAddress: "1/0/1" },
    ]);
    h.write("1/0/1", true)
      .settle()
      .expectState("act", { on: [true, false] });
  });

  it("refuses bad requests with typed errors that name the field", () => {
    const sim = createSimulation(lightBench(), { seed: 1 });
    expect(sim.sendGroupWrite("1/0/1", 5)).toMatchObject({
      ok: false,
      error: { kind: "sim.value-invalid", field: "value" },
    });
    expect(sim.sendGroupWrite("9/1/9", true)).toMatchObject({
      ok: false,
      error: { kind: "sim.group-address-unknown", field: "groupAddress" },
    });
    expect(sim.sendGroupWrite("1/x", true)).toMatchObject({
      ok: false,
      error: { kind: "sim.group-address-invalid" },
    });
    expect(sim.sendGroupWrite("1/0/1", true, { from: "ghost" })).toMatchObject({
      ok: false,
      error: { kind: "sim.device-unknown", field: "from" },
    });
    expect(sim.pressButton("pb", "channel-7")).toMatchObject({
      ok: false,
      error: { kind: "sim.button-unknown", field: "button" },
    });
    expect(sim.injectFault("nowhere", "x")).toMatchObject({
      ok: false,
      error: { kind: "sim.fault-target-unknown" },
    });
    const bad = sim.setParameter("act", "channels", 9);
    expect(bad.ok).toBe(false);
    // One SimError naming the field, with the bench check's problems kept beside it.
    expect(!bad.ok && bad.error).toMatchObject({
      kind: "sim.parameters-invalid",
      field: "devices[1].parameters.channels",
      issues: [{ kind: "bench.parameters-invalid", path: "devices[1].parameters.channels" }],
    });
    expect(sim.apply({ kind: "press", device: "pb", button: "channel-1" })).toMatchObject({
      ok: true,
      value: { atUs: 0 },
    });
    expect(sim.trace.findLast((e) => e.kind === "user.action")).toMatchObject({
      kind: "user.action",
      input: { kind: "press", device: "pb", button: "channel-1" },
    });
    expect(tryCreateSimulation({ format: 1 }, { seed: 1 }).ok).toBe(false);
  });

  it("keeps no trace with capacity 0 but still tells subscribers", () => {
    const sim = createSimulation(lightBench(), { seed: 1, traceCapacity: 0 });
    const seen: string[] = [];
    sim.subscribe((e) => seen.push(e.kind));
    sim.sendGroupWrite("1/0/1", true);
    sim.runUntilIdle();
    expect(sim.trace).toEqual([]);
    expect(seen).toContain("telegram.acked");
  });
});

describe("bus statistics", () => {
  it("counts a telegram still on the line in the window its frame started in, and only there", () => {
    const probe = SimHarness.create(lightBench());
    probe.write("1/0/1", true).runFor("1s");
    const startUs = probe.events({ kinds: ["telegram.sent"] })[0]!.timeUs;
    const h = SimHarness.create(lightBench());
    h.write("1/0/1", true);
    // Mid-frame: 1 ms into the write's frame (a 9-octet frame lasts 117 bit times, about 12 ms).
    h.sim.runUntil(startUs + 1_000);
    const during = h.sim.busStats(startUs + 1_000);
    expect(during.byGroupAddress.get(0x0801)).toBe(1);
    expect(during.telegrams).toBe(1);
    // Occupied so far: the 50 idle bit times before the frame and 1 ms of it (Basic course accounting).
    expect(during.occupiedUs).toBe(bitTimesToUs(50) + 1_000);
    // The next window holds the rest of it, not the telegram again.
    h.sim.runUntil(startUs + 1_000 + 1_000_000);
    const after = h.sim.busStats(1_000_000);
    expect(after.byGroupAddress.get(0x0801)).toBeUndefined();
    expect(during.occupiedUs + after.occupiedUs).toBe(2 * bitTimesToUs(193));
  });

  it("counts a telegram's 193 bit times as load, per address and per sender", () => {
    const h = SimHarness.create(lightBench());
    h.write("1/0/1", true).runUntil("1s");
    const stats = h.sim.busStats(1_000_000);
    // Two acknowledged short telegrams (the write and the status), 193 bit times each (Basic course).
    expect(stats.occupiedUs).toBe(2 * bitTimesToUs(193));
    expect(stats.loadPercent).toBeCloseTo((2 * 20104) / 10_000, 6);
    expect(stats.busyUs).toBe(2 * (SHORT_FRAME_US + bitTimesToUs(11)));
    expect([...stats.bySender]).toEqual([
      ["act", 1],
      ["test-tool", 1],
    ]);
    expect(stats.byGroupAddress.get(0x0801)).toBe(1);
    expect(h.sim.telegramCounts().bySender.get("act")).toBe(1);
  });
});

function unwrap<T>(result: { ok: true; value: T } | { ok: false; error: unknown }): T {
  if (!result.ok) throw new Error(JSON.stringify(result.error));
  return result.value;
}
