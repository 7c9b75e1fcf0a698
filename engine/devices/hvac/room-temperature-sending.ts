import { z } from "zod";
import type { SendingCondition } from "../device-type";

/**
 * When a device sends its room temperature on KNX: never, on change by a delta
 * with a minimum interval between sends, cyclically, or both.
 * Defaults follow common practice (no published source): 0.1 K, at least 30 s apart.
 */
export const roomTemperatureSendingSchema = z.object({
  mode: z.enum(["off", "on-change", "cyclic", "on-change-and-cyclic"]).default("on-change"),
  /** Smallest change that triggers a send, kelvin. */
  deltaK: z
    .number()
    .min(0.01, "deltaK must be at least 0.01 K (the DPT 9.001 resolution)")
    .max(10)
    .default(0.1),
  /** Minimum time between two on-change sends, seconds. */
  minIntervalS: z.number().min(0).max(3600).default(30),
  /** Longest silence with cyclic sending, seconds: every send (cyclic or on change) restarts the cycle. */
  cycleS: z.number().min(10, "cycleS must be at least 10 s").max(86_400).default(600),
});
export type RoomTemperatureSending = z.infer<typeof roomTemperatureSendingSchema>;

/** What the sender remembers between samples. */
export interface RoomTemperatureSenderState {
  readonly lastSentC: number | null;
  readonly lastSentUs: number | null;
  readonly currentC: number | null;
  /** A change waits for the minimum interval to pass; a timer is due. */
  readonly pending: boolean;
}

export const initialSenderState: RoomTemperatureSenderState = {
  lastSentC: null,
  lastSentUs: null,
  currentC: null,
  pending: false,
};

/** The sender's decision: the value to send now (if any) and the delay of a follow-up timer (if any). */
export interface SenderStep {
  readonly state: RoomTemperatureSenderState;
  readonly sendC: number | null;
  readonly timerDelayUs: number | null;
}

const US_PER_S = 1_000_000;

// DPT spec §3.10: 9.001 carries 0.01 K resolution, so compare what would travel on the bus.
function quantize(valueC: number): number {
  return Math.round(valueC * 100) / 100;
}

function changedEnough(
  state: RoomTemperatureSenderState,
  valueC: number,
  config: RoomTemperatureSending,
): boolean {
  // The half-resolution margin keeps 21.1 - 21.0 (0.0999… in binary) counted as a 0.1 K change.
  return state.lastSentC === null || Math.abs(valueC - state.lastSentC) >= config.deltaK - 0.005;
}

/**
 * A sender state, written out: spreading it would give each result a shape of
 * its own, and the spreads of the devices holding it would then take V8's slow path.
 */
function senderState(
  lastSentC: number | null,
  lastSentUs: number | null,
  currentC: number | null,
  pending: boolean,
): RoomTemperatureSenderState {
  return { lastSentC, lastSentUs, currentC, pending };
}

function sendNow(valueC: number, nowUs: number): SenderStep {
  return {
    state: senderState(valueC, nowUs, valueC, false),
    sendC: valueC,
    timerDelayUs: null,
  };
}

function sendsOnChange(config: RoomTemperatureSending): boolean {
  return config.mode === "on-change" || config.mode === "on-change-and-cyclic";
}

/** Whether the configuration sends cyclically (the caller runs the cycle timer). */
export function sendsCyclically(config: RoomTemperatureSending): boolean {
  return config.mode === "cyclic" || config.mode === "on-change-and-cyclic";
}

/** A new temperature reading at `nowUs`: send it now, later (timer), or not at all. */
export function sampleRoomTemperature(
  state: RoomTemperatureSenderState,
  valueC: number,
  nowUs: number,
  config: RoomTemperatureSending,
): SenderStep {
  const value = quantize(valueC);
  // Most readings change nothing here; an unchanged state is kept rather than copied.
  const next =
    state.currentC === value
      ? state
      : senderState(state.lastSentC, state.lastSentUs, value, state.pending);
  if (!sendsOnChange(config)) return { state: next, sendC: null, timerDelayUs: null };
  if (!changedEnough(state, value, config))
    return {
      state: next.pending ? senderState(next.lastSentC, next.lastSentUs, value, false) : next,
      sendC: null,
      timerDelayUs: null,
    };
  const minIntervalUs = Math.round(config.minIntervalS * US_PER_S);
  if (state.lastSentUs === null || nowUs - state.lastSentUs >= minIntervalUs)
    return sendNow(value, nowUs);
  if (state.pending) return { state: next, sendC: null, timerDelayUs: null };
  return {
    state: senderState(next.lastSentC, next.lastSentUs, value, true),
    sendC: null,
    timerDelayUs: state.lastSentUs + minIntervalUs - nowUs,
  };
}

/** The minimum interval after the last send has passed: send the held change if it still counts. */
export function sendDueRoomTemperature(
  state: RoomTemperatureSenderState,
  nowUs: number,
  config: RoomTemperatureSending,
): SenderStep {
  const settled = senderState(state.lastSentC, state.lastSentUs, state.currentC, false);
  if (!state.pending || state.currentC === null)
    return { state: settled, sendC: null, timerDelayUs: null };
  if (!changedEnough(state, state.currentC, config))
    return { state: settled, sendC: null, timerDelayUs: null };
  return sendNow(state.currentC, nowUs);
}

/** The cycle timer fired: send the current value (if known); an on-change send then waits the minimum interval again. */
export function sendCyclicRoomTemperature(
  state: RoomTemperatureSenderState,
  nowUs: number,
): SenderStep {
  if (state.currentC === null) return { state, sendC: null, timerDelayUs: null };
  return sendNow(state.currentC, nowUs);
}

/**
 * Cycle period in virtual microseconds. Devices restart the cycle timer after
 * every send, so with a cycle no shorter than the minimum interval no two sends
 * come closer than the interval.
 */
export function cycleUs(config: RoomTemperatureSending): number {
  return Math.round(config.cycleS * US_PER_S);
}

/**
 * The sending conditions of a room-temperature sending block on `object`, for the
 * expected-load estimate: cyclic once per `cycleS`; on change at most once per
 * `minIntervalS`, or once per `samplePeriodS` (how often the device learns a new
 * value) when there is no minimum interval. Both at their worst case: a room whose
 * temperature keeps moving by more than `deltaK`.
 */
export function roomTemperatureSendingConditions(
  sending: RoomTemperatureSending,
  path: string,
  object: number,
  samplePeriodS: number,
): SendingCondition[] {
  const conditions: SendingCondition[] = [];
  const cyclic = sending.mode === "cyclic" || sending.mode === "on-change-and-cyclic";
  const onChange = sending.mode === "on-change" || sending.mode === "on-change-and-cyclic";
  if (cyclic && sending.cycleS > 0)
    conditions.push({
      parameter: `${path}.cycleS`,
      periodS: sending.cycleS,
      objects: [object],
      basis: `cyclic every ${sending.cycleS} s`,
    });
  if (onChange) {
    const paced = sending.minIntervalS > 0;
    conditions.push({
      parameter: `${path}.minIntervalS`,
      periodS: paced ? sending.minIntervalS : samplePeriodS,
      objects: [object],
      basis: paced
        ? `on change, at most every ${sending.minIntervalS} s`
        : `on change with no minimum interval, up to one per ${samplePeriodS} s sample`,
    });
  }
  return conditions;
}
