import { benchBuilder, type BenchBuilder } from "./bench-builder";

/**
 * A push-button ("pb-1", 1.1.1) toggling a switch actuator ("act-1", 1.1.2) on
 * 1/0/1, the actuator's status on 1/1/1 fed back to the button, on one line
 * "line-1" (1.1): a correctly wired bench to break one link at a time.
 */
export function lightsFixture(): BenchBuilder {
  return benchBuilder()
    .mainLine("line-1", "1.1", "Line 1")
    .groupAddress("1/0/1", "1.001", "Lights switch")
    .groupAddress("1/1/1", "1.001", "Lights status")
    .device("pb-1", "push-button", "1.1.1", {}, { name: "Door button" })
    .device("act-1", "switch-actuator", "1.1.2", {}, { name: "Lights actuator" })
    .link("pb-1", 0, "1/0/1", "1/1/1")
    .link("act-1", 0, "1/0/1")
    .link("act-1", 1, "1/1/1");
}

/**
 * A hall rocker ("pb-hall", 1.1.1) and a one-channel relay ("act-hall",
 * 1.1.2) with three addresses: 1/0/1 switching, 1/0/2 its status, 1/0/3 a
 * 5.001 dim value. Unlinked: each test wires the objects as it needs.
 */
export function hallFixture(): BenchBuilder {
  return benchBuilder()
    .groupAddress("1/0/1", "1.001", "Hall light")
    .groupAddress("1/0/2", "1.001", "Hall light status")
    .groupAddress("1/0/3", "5.001", "Hall dim value")
    .device("pb-hall", "push-button", "1.1.1", {}, { name: "Hall rocker" })
    .device("act-hall", "switch-actuator", "1.1.2", { channels: 1 }, { name: "Hall relay" });
}

/**
 * Two floors under one main line (knx-reference.md, Topology: line coupler
 * a.l.0 joins line a.l to main line a.0): lines "l11" (1.1), "m1" (1.0) and
 * "l12" (1.2), line couplers "c11" (1.1.0) and "c12" (1.2.0, with
 * `c12Parameters`), a test recorder "s" on 1.1.1 that sends on 1/0/1 and one
 * "r" on 1.2.1 that listens to it. Needs `registerTestDevices`.
 */
export function twoFloorsFixture(c12Parameters: Record<string, unknown> = {}): BenchBuilder {
  return benchBuilder()
    .mainLine("l11", "1.1")
    .line("m1", "1.0")
    .line("l12", "1.2")
    .groupAddress("1/0/1", "7.001")
    .device("c11", "coupler", "1.1.0")
    .device("c12", "coupler", "1.2.0", c12Parameters)
    .device("s", "test-recorder", "1.1.1")
    .device("r", "test-recorder", "1.2.1")
    .link("s", 0, "1/0/1")
    .link("r", 0, "1/0/1");
}
