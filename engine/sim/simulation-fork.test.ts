import { describe, expect, it } from "vitest";
import fernhill from "../../scenarios/benches/fernhill-training-centre.bench.json";
import { loadBench, type LoadedBench } from "../bench";
import { createSimulation, type Simulation } from "./index";

// The shipped training-centre bench: push-buttons, actuators and HVAC units on unit links, so
// a fork has timers, link messages in flight and telegrams on the line to carry over.
function trainingCentre(): LoadedBench {
  const loaded = loadBench(fernhill);
  if (!loaded.ok) throw new Error(loaded.error.map((e) => e.message).join("; "));
  return loaded.value;
}

/** The same inputs, at the same virtual times, on any run. */
function afterwards(sim: Simulation): void {
  const must = (result: { ok: boolean; error?: unknown }) =>
    expect(result.ok, JSON.stringify(result.error)).toBe(true);
  must(sim.pressButton("pb-door", "channel-1"));
  sim.runFor(150_000);
  must(sim.injectFault("gw-rear", "bus.nak"));
  must(sim.sendGroupWrite("1/1/1", true));
  sim.runFor(30_000);
  must(sim.clearFault("gw-rear", "bus.nak"));
  must(sim.injectFault("link-front", "link.broken"));
  sim.runFor(45_000_000);
  must(sim.clearFault("link-front", "link.broken"));
  must(sim.setParameter("rts-lab", "outdoorC", 5));
  sim.runFor(20_000_000);
}

const minutesUs = (minutes: number) => minutes * 60_000_000;

function text(sim: Simulation): string {
  return JSON.stringify(sim.trace);
}

describe("Simulation.fork", () => {
  it("continues exactly as the run it was taken from, from any moment (timers, link messages, telegrams in flight)", () => {
    const bench = trainingCentre();
    const straight = createSimulation(bench, { seed: 3 });
    afterwards(straight);

    for (const forkAtUs of [0, 1_000_000, 1_004_000, 12_345_678]) {
      const original = createSimulation(bench, { seed: 3 });
      original.injectFault("iu-rear", "bus.busy"); // repetitions pending when the fork is taken
      original.clearFault("iu-rear", "bus.busy");
      original.runUntil(forkAtUs);
      const fork = original.fork();
      expect(fork.nowUs).toBe(original.nowUs);
      afterwards(fork);
      afterwards(original);
      expect(text(fork)).toBe(text(original));
      expect(fork.deviceState("iu-front")).toEqual(original.deviceState("iu-front"));
      expect(fork.busStats(60_000_000)).toEqual(original.busStats(60_000_000));
    }
    // The inputs before the fork leave their own trace; the rest matches the straight run's length.
    expect(straight.trace.length).toBeGreaterThan(100);
  });

  it("carries a line history that has wrapped (a small ring) over to the fork", () => {
    const bench = trainingCentre();
    const original = createSimulation(bench, { seed: 3, historyCapacity: 8 });
    afterwards(original);
    const fork = original.fork();
    for (const sim of [original, fork]) {
      for (let i = 0; i < 5; i++) sim.sendGroupWrite("1/1/1", i % 2 === 0);
      sim.runFor(2_000_000);
    }
    const stats = original.busStats(minutesUs(10));
    // The ring keeps the last 8 transmissions and says the window reaches past them.
    expect(stats.transmissions).toBeLessThanOrEqual(8);
    expect(stats.truncated).toBe(true);
    expect(fork.busStats(minutesUs(10))).toEqual(stats);
    expect(fork.busStats(1_000_000)).toEqual(original.busStats(1_000_000));
  });

  it("leaves the run it was taken from untouched", () => {
    const bench = trainingCentre();
    const reference = createSimulation(bench, { seed: 5 });
    reference.runUntil(2_000_000);
    afterwards(reference);

    const original = createSimulation(bench, { seed: 5 });
    original.runUntil(2_000_000);
    const fork = original.fork();
    fork.pressButton("pb-desk", "channel-1");
    fork.injectFault("act-lab", "bus.silent");
    fork.runFor(10_000_000);
    afterwards(original);
    expect(text(original)).toBe(text(reference));
    expect(original.activeFaults("act-lab")).toEqual([]);
  });
});
