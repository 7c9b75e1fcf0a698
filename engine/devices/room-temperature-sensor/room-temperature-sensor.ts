import { DPT9_INVALID } from "../../dpt/dpt9";
import { DEFAULT_ROOM_HEAT_CAPACITY_J_PER_K } from "../../room";
import {
  STARTUP_DONE_TIMER,
  flags,
  type DeviceContext,
  type DeviceEffect,
  type DeviceEvent,
  type DeviceType,
  type TransitionResult,
} from "../device-type";
import {
  cycleUs,
  initialSenderState,
  sampleRoomTemperature,
  sendCyclicRoomTemperature,
  sendDueRoomTemperature,
  sendsCyclically,
  type RoomTemperatureSenderState,
  roomTemperatureSendingConditions,
  type SenderStep,
} from "../hvac/room-temperature-sending";
import {
  roomTemperatureSensorParametersSchema,
  type RoomTemperatureSensorParameters,
} from "./parameters";

export interface RoomTemperatureSensorState {
  /** A value set from outside (input "temperature"); overrides the source until set to null. */
  readonly overrideC: number | null;
  readonly lastSampleUs: number;
  readonly sender: RoomTemperatureSenderState;
  /** Injected fault "sensor.open": the sensor sends DPT 9 invalid data. */
  readonly open: boolean;
}

/** The sensor's only group object: temperature, DPT 9.001. */
export const ROOM_TEMPERATURE_OBJECT = 0;

const SAMPLE_TIMER = "sensor.sample";
const SEND_TIMER = "sensor.send-due";
const CYCLE_TIMER = "sensor.cycle";
const US_PER_S = 1_000_000;

type Context = DeviceContext<RoomTemperatureSensorParameters>;
type Result = TransitionResult<RoomTemperatureSensorState>;

/** The profile's value at `tS` seconds: linear between points, flat outside, repeating if asked. */
export function profileValueC(p: RoomTemperatureSensorParameters, tS: number): number {
  const points = p.profile;
  const first = points[0];
  if (first === undefined) return p.initialC;
  const t = p.profileRepeatS > 0 ? tS % p.profileRepeatS : tS;
  if (t <= first.atS) return first.valueC;
  for (let i = 1; i < points.length; i++) {
    const a = points[i - 1];
    const b = points[i];
    if (a !== undefined && b !== undefined && t <= b.atS)
      return a.valueC + ((b.valueC - a.valueC) * (t - a.atS)) / (b.atS - a.atS);
  }
  return points[points.length - 1]?.valueC ?? p.initialC;
}

function measuredC(state: RoomTemperatureSensorState, context: Context): number {
  const p = context.parameters;
  // The room it hangs in, shared with every unit and device there (engine/room).
  const trueC =
    state.overrideC ??
    (p.source === "profile"
      ? profileValueC(p, context.nowUs / US_PER_S)
      : (context.roomTemperatureC() ?? p.initialC));
  return trueC + p.offsetK;
}

function senderEffects(step: SenderStep, context: Context): DeviceEffect[] {
  const sending = context.parameters.sending;
  const effects: DeviceEffect[] = [];
  if (step.sendC !== null) {
    effects.push({
      kind: "group.send",
      object: ROOM_TEMPERATURE_OBJECT,
      service: "write",
      value: step.sendC,
    });
    // Every send restarts the cycle (see room-temperature-sending.ts).
    if (sendsCyclically(sending))
      effects.push({ kind: "timer.set", name: CYCLE_TIMER, delayUs: cycleUs(sending) });
  }
  if (step.timerDelayUs !== null)
    effects.push({ kind: "timer.set", name: SEND_TIMER, delayUs: step.timerDelayUs });
  return effects;
}

/** A sensor state written out field by field: sampling runs every few seconds, and chained spreads of it ran V8's slow copy. */
function sensorState(
  overrideC: number | null,
  lastSampleUs: number,
  sender: RoomTemperatureSenderState,
  open: boolean,
): RoomTemperatureSensorState {
  return { overrideC, lastSampleUs, sender, open };
}

/** A sample now; its effects array is the caller's to extend. */
function sample(
  state: RoomTemperatureSensorState,
  context: Context,
): Result & { readonly effects: DeviceEffect[] } {
  const p = context.parameters;
  const nowUs = context.nowUs;
  if (state.open)
    return { state: sensorState(state.overrideC, nowUs, state.sender, true), effects: [] };
  const valueC = measuredC(state, context);
  const step = sampleRoomTemperature(state.sender, valueC, nowUs, p.sending);
  const effects = senderEffects(step, context);
  const next = sensorState(state.overrideC, nowUs, step.state, false);
  if (step.sendC !== null) return { state: next, effects, transition: "temperature.sent" };
  effects.push({
    kind: "object.store",
    object: ROOM_TEMPERATURE_OBJECT,
    value: Math.round(valueC * 100) / 100,
  });
  return { state: next, effects };
}

function roomTemperatureSensorTransition(
  state: RoomTemperatureSensorState,
  event: DeviceEvent,
  context: Context,
): Result {
  const p = context.parameters;
  const sampleTimer: DeviceEffect = {
    kind: "timer.set",
    name: SAMPLE_TIMER,
    delayUs: Math.round(p.sampleS * US_PER_S),
  };
  switch (event.kind) {
    case "start": {
      const first = sample({ ...state, lastSampleUs: context.nowUs }, context);
      const cycle: DeviceEffect[] = sendsCyclically(p.sending)
        ? [{ kind: "timer.set", name: CYCLE_TIMER, delayUs: cycleUs(p.sending) }]
        : [];
      return { ...first, effects: [...cycle, ...first.effects, sampleTimer] };
    }
    case "timer": {
      if (event.name === SAMPLE_TIMER) {
        const sampled = sample(state, context);
        sampled.effects.push(sampleTimer);
        return sampled;
      }
      if (state.open) return { state, effects: [] };
      if (event.name === STARTUP_DONE_TIMER) {
        // The start-up send was a send: the minimum interval and the cycle count from it.
        const sentC = context.objectValue(ROOM_TEMPERATURE_OBJECT);
        if (typeof sentC !== "number") return { state, effects: [] };
        return {
          state: {
            ...state,
            sender: { ...state.sender, lastSentC: sentC, lastSentUs: context.nowUs },
          },
          effects: sendsCyclically(p.sending)
            ? [{ kind: "timer.set", name: CYCLE_TIMER, delayUs: cycleUs(p.sending) }]
            : [],
        };
      }
      const step =
        event.name === SEND_TIMER
          ? sendDueRoomTemperature(state.sender, context.nowUs, p.sending)
          : event.name === CYCLE_TIMER
            ? sendCyclicRoomTemperature(state.sender, context.nowUs)
            : null;
      if (step === null) return { state, effects: [] };
      return {
        state: { ...state, sender: step.state },
        effects: senderEffects(step, context),
        ...(step.sendC !== null ? { transition: "temperature.sent" } : {}),
      };
    }
    case "input": {
      if (event.input !== "temperature") return { state, effects: [] };
      const overrideC = typeof event.value === "number" ? event.value : null;
      const sampled = sample({ ...state, overrideC }, context);
      return { ...sampled, transition: sampled.transition ?? "temperature.set" };
    }
    case "fault.inject":
    case "fault.clear": {
      if (event.fault !== "sensor.open") return { state, effects: [] };
      const open = event.kind === "fault.inject";
      if (!open)
        return {
          ...sample({ ...state, open: false, sender: initialSenderState }, context),
          transition: "sensor.restored",
        };
      // DPT spec §3.10: 0x7FFF "invalid data".
      return {
        state: { ...state, open: true },
        effects: [
          {
            kind: "group.send",
            object: ROOM_TEMPERATURE_OBJECT,
            service: "write",
            value: DPT9_INVALID,
          },
        ],
        transition: "sensor.open",
      };
    }
    default:
      return { state, effects: [] };
  }
}

/**
 * KNX room temperature sensor (DPT 9.001): measures every `sampleS` the room it
 * is in (the bench's room, shared with the units there; else a room of its own
 * cooling toward `outdoorC`) or a profile over time, and
 * sends on change, cyclically, or both. Input "temperature" overrides the value.
 */
export const roomTemperatureSensorType: DeviceType<
  RoomTemperatureSensorParameters,
  RoomTemperatureSensorState
> = {
  id: "room-temperature-sensor",
  label: "Room temperature sensor",
  description:
    "Room temperature (DPT 9.001) from a room model or a profile, sent on change and/or cyclically.",
  medium: "knx",
  parameters: roomTemperatureSensorParametersSchema,
  groupObjects: () => [
    {
      number: ROOM_TEMPERATURE_OBJECT,
      name: "Room temperature",
      dpt: "9.001",
      flags: flags("CRT"),
      role: "output",
    },
  ],
  buttons: () => [],
  initialState: () => ({
    overrideC: null,
    lastSampleUs: 0,
    sender: initialSenderState,
    open: false,
  }),
  transition: roomTemperatureSensorTransition,
  // It learns a new value once per sample, so on change without a minimum interval sends at most that often.
  sendingConditions: (p) =>
    roomTemperatureSendingConditions(p.sending, "sending", ROOM_TEMPERATURE_OBJECT, p.sampleS),
  // A bench without rooms: the sensor's room is its own (Newton's law of cooling toward outdoorC, τ = timeConstantS).
  privateRoom: (p) =>
    p.source === "room-model"
      ? {
          initialC: p.initialC,
          outdoorC: p.outdoorC,
          heatCapacityJPerK: DEFAULT_ROOM_HEAT_CAPACITY_J_PER_K,
          envelopeUaWPerK: DEFAULT_ROOM_HEAT_CAPACITY_J_PER_K / p.timeConstantS,
        }
      : undefined,
  startupDelayS: (p) => p.startupDelayS,
};
