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
