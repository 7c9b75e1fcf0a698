import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  cycleUs,
  initialSenderState,
  roomTemperatureSendingSchema,
  sampleRoomTemperature,
  sendCyclicRoomTemperature,
  sendDueRoomTemperature,
  sendsCyclically,
  type RoomTemperatureSending,
  type RoomTemperatureSenderState,
  type SenderStep,
} from "./room-temperature-sending";

const S = 1_000_000;
const centi = (valueC: number) => Math.round(valueC * 100);

interface Step {
  readonly dtUs: number;
  readonly deltaCentiK: number;
}

/** Runs a temperature path through the sender the way a device does (timers fire at their due time) and checks the two rules after every event. */
function runPath(startC: number, steps: readonly Step[], config: RoomTemperatureSending) {
  let state: RoomTemperatureSenderState = initialSenderState;
  let dueUs: number | null = null;
  let nextCycleUs: number | null = sendsCyclically(config) ? cycleUs(config) : null;
  const sends: { timeUs: number; valueC: number }[] = [];
  const violations: string[] = [];
  const minIntervalUs = config.minIntervalS * S;
  const apply = (step: SenderStep, nowUs: number) => {
    state = step.state;
    if (step.sendC !== null) sends.push({ timeUs: nowUs, valueC: step.sendC });
    // Any send restarts the cycle: the cycle is the longest silence, as the devices run it.
    if (step.sendC !== null && nextCycleUs !== null) nextCycleUs = nowUs + cycleUs(config);
    if (step.timerDelayUs !== null) dueUs = nowUs + step.timerDelayUs;
  };
  const check = (nowUs: number) => {
    // Oracle in whole hundredths of a kelvin (the DPT 9.001 resolution), independent of the sender's own comparison.
    if (state.currentC === null || state.lastSentC === null || state.lastSentUs === null) return;
    const changed =
      Math.abs(centi(state.currentC) - centi(state.lastSentC)) >= Math.round(config.deltaK * 100);
    if (changed && nowUs >= state.lastSentUs + minIntervalUs)
      violations.push(`change ${state.lastSentC} -> ${state.currentC} unsent at ${nowUs} µs`);
  };
  const runTimersUntil = (untilUs: number) => {
    for (;;) {
      const candidates = [dueUs, nextCycleUs].filter(
        (t): t is number => t !== null && t <= untilUs,
      );
      if (candidates.length === 0) return;
      const atUs = Math.min(...candidates);
      if (atUs === dueUs) {
        dueUs = null;
        apply(sendDueRoomTemperature(state, atUs, config), atUs);
      } else {
        apply(sendCyclicRoomTemperature(state, atUs), atUs);
      }
      check(atUs);
    }
  };
  let nowUs = 0;
  let valueC = startC;
  apply(sampleRoomTemperature(state, valueC, nowUs, config), nowUs);
  for (const step of steps) {
    nowUs += step.dtUs;
    runTimersUntil(nowUs);
    valueC += step.deltaCentiK / 100;
    apply(sampleRoomTemperature(state, valueC, nowUs, config), nowUs);
    check(nowUs);
  }
  runTimersUntil(nowUs + minIntervalUs);
  check(nowUs + minIntervalUs);
  return { sends, violations };
}

const stepArbitrary = fc.record({
  dtUs: fc.integer({ min: 0, max: 90 * S }),
  deltaCentiK: fc.integer({ min: -40, max: 40 }),
});
const pathArbitrary = fc.tuple(
  fc.integer({ min: 1000, max: 3000 }).map((c) => c / 100),
  fc.array(stepArbitrary, { maxLength: 200 }),
);

function minGapUs(sends: readonly { timeUs: number }[]): number {
  let gap = Number.POSITIVE_INFINITY;
  for (let i = 1; i < sends.length; i++)
    gap = Math.min(gap, (sends[i]?.timeUs ?? 0) - (sends[i - 1]?.timeUs ?? 0));
  return gap;
}

describe("room temperature sending on change", () => {
  // Common practice, no published source: on change by 0.1 K, at least 30 s between sends.
  const config = roomTemperatureSendingSchema.parse({ mode: "on-change" });

  it("never sends twice within the minimum interval (property)", () => {
    fc.assert(
      fc.property(pathArbitrary, ([startC, steps]) => {
        expect(minGapUs(runPath(startC, steps, config).sends)).toBeGreaterThanOrEqual(30 * S);
      }),
    );
  });

  it("never leaves a change of 0.1 K or more unsent after the interval (property)", () => {
    fc.assert(
      fc.property(pathArbitrary, ([startC, steps]) => {
        expect(runPath(startC, steps, config).violations).toEqual([]);
      }),
    );
  });

  it("keeps both rules for any delta and interval (property)", () => {
    fc.assert(
      fc.property(
        pathArbitrary,
        fc.integer({ min: 1, max: 100 }),
        fc.integer({ min: 0, max: 120 }),
        ([startC, steps], deltaCentiK, minIntervalS) => {
          const custom = roomTemperatureSendingSchema.parse({
            mode: "on-change",
            deltaK: deltaCentiK / 100,
            minIntervalS,
          });
          const run = runPath(startC, steps, custom);
          expect(run.violations).toEqual([]);
          expect(minGapUs(run.sends)).toBeGreaterThanOrEqual(minIntervalS * S);
        },
      ),
    );
  });

  it("with cyclic sending too, keeps both rules when the cycle is no shorter than the interval (property)", () => {
    const both = roomTemperatureSendingSchema.parse({ mode: "on-change-and-cyclic", cycleS: 45 });
    fc.assert(
      fc.property(pathArbitrary, ([startC, steps]) => {
        const run = runPath(startC, steps, both);
        expect(run.violations).toEqual([]);
        expect(minGapUs(run.sends)).toBeGreaterThanOrEqual(30 * S);
      }),
    );
  });

  it("counts 21.0 -> 21.1 as a 0.1 K change despite binary rounding", () => {
    const first = sampleRoomTemperature(initialSenderState, 21.0, 0, config);
    expect(sampleRoomTemperature(first.state, 21.1, 40 * S, config).sendC).toBe(21.1);
  });

  it("holds a change inside the interval and sends it when the interval ends", () => {
    const first = sampleRoomTemperature(initialSenderState, 20, 0, config);
    const held = sampleRoomTemperature(first.state, 20.3, 5 * S, config);
    expect(held).toMatchObject({ sendC: null, timerDelayUs: 25 * S });
    expect(sendDueRoomTemperature(held.state, 30 * S, config).sendC).toBe(20.3);
  });

  it("drops a held change that went back below the delta", () => {
    const first = sampleRoomTemperature(initialSenderState, 20, 0, config);
    const held = sampleRoomTemperature(first.state, 20.3, 5 * S, config);
    const back = sampleRoomTemperature(held.state, 20.05, 10 * S, config);
    expect(sendDueRoomTemperature(back.state, 30 * S, config).sendC).toBeNull();
  });

  it("sends nothing on change when the mode is cyclic or off", () => {
    for (const mode of ["off", "cyclic"] as const) {
      const quiet = roomTemperatureSendingSchema.parse({ mode });
      expect(sampleRoomTemperature(initialSenderState, 20, 0, quiet).sendC).toBeNull();
    }
  });
});
