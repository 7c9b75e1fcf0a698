import { DPT9_INVALID, isDptInvalid } from "../../dpt/dpt9";
import {
  STARTUP_DONE_TIMER,
  type DeviceContext,
  type DeviceEffect,
  type DeviceEvent,
  type TransitionResult,
} from "../device-type";
import {
  linkFaultEffects,
  periodicAnnounceEffects,
  withRoleAnnouncement,
} from "../hvac/controller-link";
import { faultDisplayText, hvacFaults } from "../hvac/fault-ids";
import {
  dpt1100FromMode,
  dpt20105FromMode,
  modeFromDpt1100,
  modeFromDpt20105,
  modesAllowedFor,
  type HvacMode,
  type SystemDirection,
} from "../hvac/hvac-mode";
import {
  cycleUs,
  initialSenderState,
  sampleRoomTemperature,
  sendCyclicRoomTemperature,
  sendDueRoomTemperature,
  sendsCyclically,
  type SenderStep,
} from "../hvac/room-temperature-sending";
import {
  parseUnitLinkMessage,
  type UnitCommand,
  type UnitStatus,
} from "../hvac/unit-link-messages";
import { fanLevelFromKnx, fanStatusToKnx } from "./fan-speed";
import { gatewayObjects as O } from "./objects";
import type { HvacGatewayParameters } from "./parameters";
import {
  rebuiltGatewayState,
  type GatewayFunction,
  type HvacGatewayState,
  type LearnedScene,
} from "./state";
import { withRebuiltStates } from "../rebuilt-states";

type Context = DeviceContext<HvacGatewayParameters>;
type Result = TransitionResult<HvacGatewayState>;

const ROOM_SEND_TIMER = "room.send-due";
const ROOM_CYCLE_TIMER = "room.cycle";
/** Watchdog re-armed by every message from the unit. */
const UNIT_WATCH_TIMER = "unit.watch";
/** Watchdog re-armed by every external room temperature. */
const EXTERNAL_WATCH_TIMER = "room.external-watch";
const US_PER_S = 1_000_000;
const WINDOW_DELAY_TIMER = "window.delay";
const STATUS_CYCLE_TIMER = "status.cycle";

/** The limits in force for the direction the unit runs: the mode's own when set, else the general ones. */
function limitsFor(p: HvacGatewayParameters, direction: SystemDirection | undefined) {
  const own =
    direction === "heating"
      ? p.heatingLimits
      : direction === "cooling"
        ? p.coolingLimits
        : undefined;
  return own ?? { setpointMinC: p.setpointMinC, setpointMaxC: p.setpointMaxC };
}

function clampSetpoint(p: HvacGatewayParameters, valueC: number, direction?: SystemDirection) {
  const limits = limitsFor(p, direction);
  return Math.min(limits.setpointMaxC, Math.max(limits.setpointMinC, valueC));
}

function named(state: HvacGatewayState, transition: string, effects: DeviceEffect[] = []): Result {
  return { state, effects, transition };
}

function sendCommand(command: Omit<UnitCommand, "kind">, context: Context): DeviceEffect[] {
  return context.links.map((link) => ({
    kind: "link.send",
    link,
    message: { kind: "unit.command", ...command },
  }));
}

/** The status objects and values for a unit status, for the objects these parameters enable. */
/** The fault object (DPT 1.005) and fault text (DPT 16.000) for the gateway's own faults and the unit's. */
function faultValues(
  unitFaults: readonly string[],
  gatewayFaults: readonly string[],
): { object: number; value: unknown }[] {
  const values: { object: number; value: unknown }[] = [];
  visitFaultValues(unitFaults, gatewayFaults, (_, object, value) => values.push({ object, value }));
  return values;
}

/** `faultValues` one by one, without building the list. */
function visitFaultValues(
  unitFaults: readonly string[],
  gatewayFaults: readonly string[],
  visit: StatusVisitor,
): void {
  const first = gatewayFaults[0] ?? unitFaults[0];
  visit(undefined, O.fault, first !== undefined);
  visit(undefined, O.faultText, first === undefined ? "" : faultDisplayText(first));
}

/** Sends the fault objects where they changed: supervision raises faults with no unit status to carry them. */
function sendChangedFaults(
  state: HvacGatewayState,
  gatewayFaults: readonly string[],
  context: Context,
): DeviceEffect[] {
  return faultValues(state.unit?.faults ?? [], gatewayFaults)
    .filter((entry) => context.objectValue(entry.object) !== entry.value)
    .map((entry) => ({
      kind: "group.send",
      object: entry.object,
      service: "write",
      value: entry.value,
    }));
}

/** One status object and the value a unit status gives it; `fn` names the function it reports, if any. */
type StatusVisitor = (fn: GatewayFunction | undefined, object: number, value: unknown) => void;

function statusValues(
  unit: UnitStatus,
  p: HvacGatewayParameters,
  modeConflict: boolean,
  gatewayFaults: readonly string[],
): { fn?: GatewayFunction; object: number; value: unknown }[] {
  const values: { fn?: GatewayFunction; object: number; value: unknown }[] = [];
  visitStatusValues(unit, p, modeConflict, gatewayFaults, (fn, object, value) =>
    values.push(fn === undefined ? { object, value } : { fn, object, value }),
  );
  return values;
}

/**
 * `statusValues` one by one, in the same order, without building the list: a
 * gateway runs through them at every unit status, and most entries are unchanged.
 */
function visitStatusValues(
  unit: UnitStatus,
  p: HvacGatewayParameters,
  modeConflict: boolean,
  gatewayFaults: readonly string[],
  visit: StatusVisitor,
): void {
  visit("power", O.powerStatus, unit.power);
  visit("setpoint", O.setpointStatus, unit.setpointC);
  visit("fan", O.fanStatus, fanStatusToKnx(unit.fanLevel, p.fanEncoding, p.fanLevels));
  visitFaultValues(unit.faults, gatewayFaults, visit);
  if (p.modeControl === "full") visit("mode", O.modeStatus, dpt20105FromMode(unit.mode));
  else {
    // DPT spec §4.2 (1.100): 0 cooling, 1 heating. Fan has no heat/cool meaning of its own: on a
    // multi-split the direction the outdoor unit imposes is the one in force; else the status keeps its value.
    const heating =
      dpt1100FromMode(unit.mode, unit.direction) ?? heatingInForce(unit.systemDirection);
    if (heating !== undefined) visit("mode", O.heatCoolStatus, heating);
  }
  if (p.fanAutoObject) visit("fan", O.fanAutoStatus, unit.fanLevel === 0);
  if (p.fanHeldStatus) visit(undefined, O.fanHeld, (unit.fanHeld ?? null) !== null);
  if (p.frostProtectionStatus) visit(undefined, O.frostProtection, unit.frostProtection === true);
  if (p.filterAlarm) visit(undefined, O.filterAlarm, unit.filterAlarm === true);
  if (p.localLock) visit(undefined, O.localLockStatus, unit.localLocked === true);
  if (p.outdoorTemperature && unit.outdoorC !== undefined)
    visit(undefined, O.outdoorTemperature, unit.outdoorC);
  if (p.louvre) visit("louvre", O.louvreStatus, unit.louvrePercent);
  if (p.systemType === "multi-split") {
    visit(undefined, O.modeAuthority, unit.modeAuthority);
    visit(undefined, O.modeConflict, modeConflict);
  }
}

function heatingInForce(direction: SystemDirection | undefined): boolean | undefined {
  return direction === "heating" ? true : direction === "cooling" ? false : undefined;
}

/**
 * Whether the mode asked for on KNX is held off by the shared outdoor unit: the
 * unit runs something else because the system moves heat the other way. Common
 * practice, no published source: a multi-split member whose request conflicts
 * with the system keeps the request and shows a conflict until the system allows it.
 */
function modeHeldOff(request: HvacMode | null, unit: UnitStatus): boolean {
  if (request === null || unit.mode === request) return false;
  return !modesAllowedFor(unit.systemDirection ?? "none").includes(request);
}

/** Sends the status of `fns` now from the last unit status (a refused command snaps visualisations back). */
function reassert(
  state: HvacGatewayState,
  fns: readonly GatewayFunction[],
  context: Context,
): DeviceEffect[] {
  if (state.unit === null) return [];
  return statusValues(state.unit, context.parameters, state.modeConflict, state.gatewayFaults)
    .filter((entry) => entry.fn !== undefined && fns.includes(entry.fn))
    .map((entry) => ({
      kind: "group.send",
      object: entry.object,
      service: "write",
      value: entry.value,
    }));
}

function roomEffects(step: SenderStep, context: Context): DeviceEffect[] {
  const effects: DeviceEffect[] = [];
  const sending = context.parameters.roomTemperatureSending;
  if (step.sendC !== null)
    effects.push({
      kind: "group.send",
      object: O.roomTemperature,
      service: "write",
      value: step.sendC,
    });
  // Every send restarts the cycle, so cyclic and on-change sends keep the minimum interval apart.
  if (step.sendC !== null && sendsCyclically(sending))
    effects.push({ kind: "timer.set", name: ROOM_CYCLE_TIMER, delayUs: cycleUs(sending) });
  if (step.timerDelayUs !== null)
    effects.push({ kind: "timer.set", name: ROOM_SEND_TIMER, delayUs: step.timerDelayUs });
  return effects;
}

function watchUnit(context: Context): DeviceEffect {
  return {
    kind: "timer.set",
    name: UNIT_WATCH_TIMER,
    delayUs: context.parameters.unitTimeoutS * US_PER_S,
  };
}

/**
 * The unit was heard: re-arm the watchdog and, if it had been lost, clear the
 * fault (sending the fault objects unless a unit status that follows will). Common practice, no published source: gateways supervise their unit
 * and report a lost unit on KNX, clearing it when communication returns.
 */
function unitHeard(state: HvacGatewayState, context: Context, sendFaults: boolean): Result {
  const lost = state.gatewayFaults.includes(hvacFaults.unitLost);
  if (!lost) return { state, effects: [watchUnit(context)] };
  const gatewayFaults = state.gatewayFaults.filter((f) => f !== hvacFaults.unitLost);
  return {
    state: { ...state, gatewayFaults },
    effects: [
      watchUnit(context),
      { kind: "fault.clear", fault: hvacFaults.unitLost },
      ...(sendFaults ? sendChangedFaults(state, gatewayFaults, context) : []),
    ],
    transition: "unit.communication-restored",
  };
}

function onUnitLost(state: HvacGatewayState, context: Context): Result {
  if (state.gatewayFaults.includes(hvacFaults.unitLost)) return { state, effects: [] };
  const gatewayFaults = [hvacFaults.unitLost, ...state.gatewayFaults];
  return named({ ...state, gatewayFaults }, hvacFaults.unitLost, [
    {
      kind: "fault.raise",
      fault: hvacFaults.unitLost,
      text: `nothing heard from the indoor unit for ${context.parameters.unitTimeoutS} s`,
    },
    ...sendChangedFaults(state, gatewayFaults, context),
  ]);
}

function watchExternal(context: Context): DeviceEffect[] {
  const p = context.parameters;
  if (p.roomTemperatureSource !== "external" || p.externalTemperatureTimeoutS === 0) return [];
  return [
    {
      kind: "timer.set",
      name: EXTERNAL_WATCH_TIMER,
      delayUs: p.externalTemperatureTimeoutS * US_PER_S,
    },
  ];
}

/**
 * No external temperature for the configured time: the unit goes back to its
 * own sensor rather than hold a stale value, and the fault objects say so.
 * Common practice, no published source.
 */
function onExternalLost(state: HvacGatewayState, context: Context): Result {
  const fault = hvacFaults.externalTemperatureLost;
  if (state.gatewayFaults.includes(fault) || context.parameters.role !== "primary")
    return { state, effects: [] };
  const gatewayFaults = [...state.gatewayFaults, fault];
  return named({ ...state, gatewayFaults }, fault, [
    {
      kind: "fault.raise",
      fault,
      text: `no external room temperature for ${context.parameters.externalTemperatureTimeoutS} s: the unit controls on its own sensor`,
    },
    ...sendCommand({ externalRoomC: null }, context),
    ...sendChangedFaults(state, gatewayFaults, context),
  ]);
}

function onUnitStatus(state: HvacGatewayState, unit: UnitStatus, context: Context): Result {
  const p = context.parameters;
  const first = state.unit === null;
  const effects: DeviceEffect[] = [];
  // Another controller changed the mode meanwhile: that supersedes the KNX request.
  const superseded =
    state.unit !== null &&
    state.unit.mode !== unit.mode &&
    unit.mode !== state.modeRequest &&
    unit.refusal === undefined;
  const modeRequest = superseded ? null : state.modeRequest;
  const modeConflict = modeHeldOff(modeRequest, unit);
  // The unit changed direction: a setpoint outside the new direction's limits is brought inside.
  const limited =
    state.unit !== null && state.unit.direction !== unit.direction
      ? clampSetpoint(p, unit.setpointC, unit.direction)
      : unit.setpointC;
  if (limited !== unit.setpointC) effects.push(...sendCommand({ setpointC: limited }, context));
  // The system now allows the kept request: ask for it again.
  const reapply =
    state.modeConflict && !modeConflict && modeRequest !== null && unit.mode !== modeRequest;
  if (reapply) effects.push(...sendCommand({ mode: modeRequest }, context));
  let sentStatus = false;
  visitStatusValues(unit, p, modeConflict, state.gatewayFaults, (fn, object, value) => {
    const pending = fn !== undefined && state.pendingStatus.includes(fn);
    if (!pending && context.objectValue(object) === value) return;
    // The first report only fills the status objects (they answer reads); later changes are sent.
    if (first && !pending) effects.push({ kind: "object.store", object, value });
    else {
      effects.push({ kind: "group.send", object, service: "write", value });
      sentStatus = true;
    }
  });
  let roomSender = state.roomSender;
  if (unit.roomC === null) {
    // DPT spec §3.10: 0x7FFF "invalid data" tells KNX the unit cannot read the room.
    if (
      p.roomTemperatureSending.mode !== "off" &&
      !isDptInvalid(context.objectValue(O.roomTemperature))
    ) {
      effects.push({
        kind: "group.send",
        object: O.roomTemperature,
        service: "write",
        value: DPT9_INVALID,
      });
    }
    roomSender = initialSenderState;
  } else if (
    p.roomTemperatureSending.mode === "off" ||
    p.roomTemperatureSending.mode === "cyclic"
  ) {
    roomSender = sampleRoomTemperature(
      roomSender,
      unit.roomC,
      context.nowUs,
      p.roomTemperatureSending,
    ).state;
    effects.push({ kind: "object.store", object: O.roomTemperature, value: unit.roomC });
  } else {
    const step = sampleRoomTemperature(
      roomSender,
      unit.roomC,
      context.nowUs,
      p.roomTemperatureSending,
    );
    roomSender = step.state;
    effects.push(...roomEffects(step, context));
  }
  const faults = linkFaultEffects(state.faults, unit);
  effects.push(...faults.effects);
  const next: HvacGatewayState = {
    ...state,
    unit,
    pendingStatus: [],
    roomSender,
    faults: unit.faults,
    modeRequest,
    modeConflict,
  };
  const refusedHere =
    unit.refusal?.controller === context.deviceId ? unit.refusal.transition : undefined;
  const conflictChanged =
    modeConflict === state.modeConflict
      ? undefined
      : modeConflict
        ? "mode.conflict"
        : reapply
          ? "mode.request-reapplied"
          : "mode.conflict-cleared";
  const transition =
    refusedHere ??
    conflictChanged ??
    (limited !== unit.setpointC ? "setpoint.limited-for-mode" : undefined) ??
    faults.changed ??
    (sentStatus ? "status.sent" : undefined);
  return { state: next, effects, ...(transition === undefined ? {} : { transition }) };
}

/** A command for the unit from KNX; refused while locked, with the affected status sent back. */
function knxCommand(
  state: HvacGatewayState,
  fn: GatewayFunction,
  command: Omit<UnitCommand, "kind">,
  transition: string,
  context: Context,
): Result {
  if (state.locked) {
    return named(state, "lock.command-refused", [
      { kind: "note", text: `${fn} command refused: the gateway is locked` },
      ...reassert(state, [fn], context),
    ]);
  }
  const pendingStatus = state.pendingStatus.includes(fn)
    ? state.pendingStatus
    : [...state.pendingStatus, fn];
  let next: HvacGatewayState = { ...state, pendingStatus };
  let held: Omit<UnitCommand, "kind"> = command;
  if (state.windowOpen && command.power !== undefined) {
    // Common practice, no published source: while the window is open the unit stays off; the wish is kept for the close.
    next = {
      ...next,
      powerAfterWindow: command.power,
      pendingStatus: next.pendingStatus.filter((f) => f !== "power"),
    };
    held = { ...command };
    delete held.power;
    if (Object.keys(held).length === 0)
      return named(next, "window.power-held", reassert(state, ["power"], context));
  }
  return named(next, transition, sendCommand(held, context));
}

/** Remembers a mode asked for on KNX (not while locked: the command is refused). */
function requesting(state: HvacGatewayState, mode: HvacMode): HvacGatewayState {
  return state.locked ? state : { ...state, modeRequest: mode };
}

/** The operating level in force: DPT 20.102 codes; presence turns comfort (or auto) into standby when empty. */
function levelInForce(state: HvacGatewayState): number {
  const asked = state.operatingMode;
  if ((asked === 0 || asked === 1) && state.occupied === false) return 2;
  return asked === 0 ? 1 : asked;
}

/** The setpoint the unit runs for a comfort setpoint at the level in force. */
function setBack(state: HvacGatewayState, comfortC: number, context: Context): number {
  const p = context.parameters;
  if (!p.operatingMode) return comfortC;
  const cooling = state.unit?.direction === "cooling";
  const sign = cooling ? 1 : -1;
  switch (levelInForce(state)) {
    case 2:
      return comfortC + sign * p.standbySetbackK;
    case 3:
      return comfortC + sign * p.economySetbackK;
    case 4:
      return cooling ? p.protectionCoolingC : p.protectionHeatingC;
    default:
      return comfortC;
  }
}

/** A new operating mode or presence: the unit gets the setpoint for the level now in force. */
function onOperatingLevel(
  state: HvacGatewayState,
  next: HvacGatewayState,
  context: Context,
): Result {
  const p = context.parameters;
  if (!p.operatingMode || state.unit === null) return named(next, "operating-mode.stored");
  const comfortC = next.baseSetpointC ?? state.unit.setpointC;
  const withComfort = { ...next, baseSetpointC: comfortC };
  const shiftedC = clampSetpoint(p, comfortC + next.shiftK, state.unit.direction);
  return named(withComfort, "operating-mode.applied", [
    ...sendCommand({ setpointC: setBack(withComfort, shiftedC, context) }, context),
    {
      kind: "group.send",
      object: O.operatingModeStatus,
      service: "write",
      value: levelInForce(next),
    },
  ]);
}

/** The shift status in the object's own encoding: kelvin (9.002) or steps (6.010). */
function shiftStatusEffect(shiftK: number, p: HvacGatewayParameters): DeviceEffect {
  const value = p.setpointShift === "steps" ? Math.round(shiftK / p.setpointShiftStepK) : shiftK;
  return { kind: "group.send", object: O.setpointShiftStatus, service: "write", value };
}

/** A relative setpoint: the base setpoint plus the shift, each kept inside its limits. */
function onShift(state: HvacGatewayState, value: unknown, context: Context): Result {
  const p = context.parameters;
  if (p.setpointShift === "off" || typeof value !== "number" || state.unit === null)
    return named(state, "setpoint.shift-refused");
  const askedK = p.setpointShift === "steps" ? value * p.setpointShiftStepK : value;
  const maxK = p.setpointShiftMaxK;
  const base = state.baseSetpointC ?? state.unit.setpointC - state.shiftK;
  const shiftedC = clampSetpoint(
    p,
    base + Math.min(maxK, Math.max(-maxK, askedK)),
    state.unit.direction,
  );
  // The shift reported is the one the limits left, so the status never promises more.
  const shiftK = Math.round((shiftedC - base) * 100) / 100;
  const setpointC = setBack(state, shiftedC, context);
  const result = knxCommand(
    state.locked ? state : { ...state, baseSetpointC: base, shiftK },
    "setpoint",
    { setpointC },
    shiftK === askedK ? "setpoint.shifted" : "setpoint.shift-limited",
    context,
  );
  if (state.locked) return result;
  return { ...result, effects: [...result.effects, shiftStatusEffect(shiftK, p)] };
}

function sceneSetting(
  state: HvacGatewayState,
  scene: number,
  p: HvacGatewayParameters,
): LearnedScene | undefined {
  return state.learnedScenes[scene] ?? p.scenes.find((slot) => slot.scene === scene);
}

function onScene(state: HvacGatewayState, scene: number, learn: boolean, context: Context): Result {
  const p = context.parameters;
  if (!p.scenes.some((slot) => slot.scene === scene)) {
    return named(state, "scene.unknown", [
      { kind: "note", text: `scene ${scene} has no slot on this gateway` },
    ]);
  }
  if (learn) {
    if (state.unit === null)
      return named(state, "scene.unknown", [
        { kind: "note", text: `scene ${scene} not learned: the unit has not reported yet` },
      ]);
    const unit = state.unit;
    const learned: LearnedScene = {
      power: state.windowOpen ? state.powerAfterWindow : unit.power,
      mode: unit.mode,
      fanLevel: Math.min(unit.fanLevel, p.fanLevels),
      setpointC: unit.setpointC,
    };
    return named(
      { ...state, learnedScenes: { ...state.learnedScenes, [scene]: learned } },
      "scene.learned",
    );
  }
  const setting = sceneSetting(state, scene, p);
  if (setting === undefined) return named(state, "scene.unknown");
  const setpointC = Math.min(p.setpointMaxC, Math.max(p.setpointMinC, setting.setpointC));
  const result = knxCommand(
    state,
    "power",
    { power: setting.power, mode: setting.mode, fanLevel: setting.fanLevel, setpointC },
    "scene.recalled",
    context,
  );
  if (result.transition !== "scene.recalled" && result.transition !== "window.power-held")
    return result;
  const pendingStatus = [
    ...new Set<GatewayFunction>([...result.state.pendingStatus, "mode", "fan", "setpoint"]),
  ];
  return { ...result, state: { ...result.state, pendingStatus }, transition: "scene.recalled" };
}

function onWrite(
  state: HvacGatewayState,
  object: number,
  value: unknown,
  context: Context,
): Result {
  const p = context.parameters;
  switch (object) {
    case O.power:
      return knxCommand(state, "power", { power: value === true }, "power.switched", context);
    case O.setpoint: {
      if (typeof value !== "number")
        return named(state, "setpoint.refused", reassert(state, ["setpoint"], context));
      const comfortC = clampSetpoint(p, value, state.unit?.direction);
      const cleared = state.shiftK !== 0;
      const result = knxCommand(
        state.locked ? state : { ...state, baseSetpointC: comfortC, shiftK: 0 },
        "setpoint",
        { setpointC: setBack(state, comfortC, context) },
        comfortC === value ? "setpoint.accepted" : "setpoint.clamped",
        context,
      );
      if (!cleared || state.locked) return result;
      return {
        ...result,
        effects: [...result.effects, shiftStatusEffect(0, p)],
      };
    }
    case O.setpointShift:
      return onShift(state, value, context);
    case O.operatingMode:
      // DPT spec §4 (20.102): 0 auto, 1 comfort, 2 standby, 3 economy, 4 building protection.
      if (!p.operatingMode || typeof value !== "number" || value < 0 || value > 4)
        return named(state, "operating-mode.refused");
      return onOperatingLevel(state, { ...state, operatingMode: value }, context);
    case O.presence:
      // DPT spec §3.1 (1.018): 1 occupied.
      if (!p.operatingMode) return { state, effects: [] };
      return onOperatingLevel(state, { ...state, occupied: value === true }, context);
    case O.filterReset:
      // DPT spec §3.1 (1.015): 1 = reset; 0 asks for nothing.
      if (!p.filterAlarm || value !== true) return { state, effects: [] };
      return named(state, "filter.reset", sendCommand({ filterReset: true }, context));
    case O.localLock:
      // Not a command for the unit's operation, so the gateway's own KNX lock does not hold it back.
      if (!p.localLock) return { state, effects: [] };
      return named(
        state,
        value === true ? "local.lock-requested" : "local.release-requested",
        sendCommand({ localLock: value === true }, context),
      );
    case O.mode: {
      const mode = typeof value === "number" ? modeFromDpt20105(value) : undefined;
      if (mode === undefined || p.modeControl !== "full") {
        return named(state, "mode.refused", [
          {
            kind: "note",
            text: `DPT 20.105 code ${String(value)} is not a mode the unit runs (0, 1, 3, 9, 14)`,
          },
          ...reassert(state, ["mode"], context),
        ]);
      }
      return knxCommand(requesting(state, mode), "mode", { mode }, "mode.selected", context);
    }
    case O.heatCool: {
      // DPT spec §4.2 (1.100): 0 = cooling, 1 = heating.
      const mode = modeFromDpt1100(value === true);
      return knxCommand(requesting(state, mode), "mode", { mode }, "mode.selected", context);
    }
    case O.fan: {
      if (typeof value !== "number") return named(state, "fan.refused");
      const asked = fanLevelFromKnx(value, p.fanEncoding, p.fanLevels);
      if (asked === 0 && (!p.fanAuto || p.fanAutoObject)) {
        return named(state, "fan.refused", [
          {
            kind: "note",
            text: p.fanAutoObject
              ? "fan value 0 refused: automatic is chosen on the automatic-fan object"
              : "fan level 0 (automatic) is not enabled",
          },
          ...reassert(state, ["fan"], context),
        ]);
      }
      const fanLevel = Math.min(asked, p.fanLevels);
      return knxCommand(
        state,
        "fan",
        { fanLevel },
        fanLevel === asked ? "fan.selected" : "fan.clamped",
        context,
      );
    }
    case O.fanAuto: {
      if (!p.fanAutoObject) return { state, effects: [] };
      if (value === true && !p.fanAuto)
        return named(state, "fan.refused", [
          { kind: "note", text: "the automatic fan is not enabled" },
          ...reassert(state, ["fan"], context),
        ]);
      // Already fixed: nothing to leave; the status answers so a visualisation snaps back.
      if (value !== true && state.unit !== null && state.unit.fanLevel !== 0)
        return named(state, "fan.selected", reassert(state, ["fan"], context));
      // Common practice, no published source: leaving automatic runs the lowest fixed level.
      const fanLevel = value === true ? 0 : 1;
      return knxCommand(state, "fan", { fanLevel }, "fan.selected", context);
    }
    case O.louvre:
      if (!p.louvre || typeof value !== "number") return named(state, "louvre.refused");
      return knxCommand(state, "louvre", { louvrePercent: value }, "louvre.positioned", context);
    case O.externalRoomTemperature:
      return onExternalRoom(state, value, context);
    case O.scene:
      return typeof value === "number"
        ? onScene(state, value, false, context)
        : named(state, "scene.unknown");
    case O.sceneControl: {
      const control = value as { learn?: unknown; scene?: unknown } | null;
      if (typeof control?.scene !== "number") return named(state, "scene.unknown");
      return onScene(state, control.scene, control.learn === true, context);
    }
    case O.windowContact: {
      // DPT spec §3.1 (1.019): 1 = open; an inverted contact sends 0 when open.
      const open = (value === true) !== p.windowContactInverted;
      return onWindowContact(state, open, context);
    }
    case O.lock:
      if ((value === true) === state.locked) return { state, effects: [] };
      return named(
        { ...state, locked: value === true },
        value === true ? "lock.engaged" : "lock.released",
      );
    default:
      return { state, effects: [] };
  }
}

function onExternalRoom(state: HvacGatewayState, value: unknown, context: Context): Result {
  const p = context.parameters;
  if (p.roomTemperatureSource !== "external") return { state, effects: [] };
  // Common practice, no published source: only the primary controller may supply the room temperature.
  if (p.role !== "primary")
    return named(state, "room.external-refused", [
      { kind: "note", text: "external room temperature ignored: this gateway is secondary" },
    ]);
  if (typeof value !== "number" || isDptInvalid(value))
    return named(state, "room.external-invalid");
  const fault = hvacFaults.externalTemperatureLost;
  const effects = [...watchExternal(context), ...sendCommand({ externalRoomC: value }, context)];
  if (!state.gatewayFaults.includes(fault)) return named(state, "room.external-updated", effects);
  const gatewayFaults = state.gatewayFaults.filter((f) => f !== fault);
  return named({ ...state, gatewayFaults }, "room.external-restored", [
    ...effects,
    { kind: "fault.clear", fault },
    ...sendChangedFaults(state, gatewayFaults, context),
  ]);
}

/**
 * The contact as it arrives: with a delay, an opening only stops the unit once
 * the delay has run with the window still open (common practice, no published source).
 */
function onWindowContact(state: HvacGatewayState, open: boolean, context: Context): Result {
  const delayS = context.parameters.windowContactDelayS;
  if (open && delayS > 0 && !state.windowOpen) {
    if (state.windowOpening) return { state, effects: [] };
    return named({ ...state, windowOpening: true }, "window.opening", [
      { kind: "timer.set", name: WINDOW_DELAY_TIMER, delayUs: delayS * US_PER_S },
    ]);
  }
  if (!open && state.windowOpening)
    return named({ ...state, windowOpening: false }, "window.closed-within-delay", [
      { kind: "timer.cancel", name: WINDOW_DELAY_TIMER },
    ]);
  return onWindow(state, open, context);
}

/** DPT 1.019: true = open. Open stops the unit; close restores the power it had (or was asked for meanwhile). */
function onWindow(state: HvacGatewayState, open: boolean, context: Context): Result {
  if (open === state.windowOpen) return { state, effects: [] };
  if (open) {
    const wasOn = state.unit?.power ?? false;
    return named(
      { ...state, windowOpen: true, powerAfterWindow: wasOn },
      "window.opened",
      wasOn ? sendCommand({ power: false }, context) : [],
    );
  }
  const next = { ...state, windowOpen: false };
  return named(
    next,
    "window.closed",
    state.powerAfterWindow ? sendCommand({ power: true }, context) : [],
  );
}

function statusCycleEffects(context: Context): DeviceEffect[] {
  const cycleS = context.parameters.statusCycleS;
  return cycleS === 0
    ? []
    : [{ kind: "timer.set", name: STATUS_CYCLE_TIMER, delayUs: cycleS * US_PER_S }];
}

/** The heartbeat: every status object sends its value again, with the room temperature it holds. */
function onStatusCycle(state: HvacGatewayState, context: Context): Result {
  const effects: DeviceEffect[] = statusCycleEffects(context);
  if (state.unit !== null) {
    const entries = statusValues(
      state.unit,
      context.parameters,
      state.modeConflict,
      state.gatewayFaults,
    );
    for (const entry of entries)
      effects.push({
        kind: "group.send",
        object: entry.object,
        service: "write",
        value: entry.value,
      });
    const roomC = context.objectValue(O.roomTemperature);
    if (typeof roomC === "number" && context.parameters.roomTemperatureSending.mode !== "off")
      effects.push({
        kind: "group.send",
        object: O.roomTemperature,
        service: "write",
        value: roomC,
      });
  }
  return named(state, "status.heartbeat", effects);
}

function onTimer(state: HvacGatewayState, name: string, context: Context): Result {
  if (name === UNIT_WATCH_TIMER) return onUnitLost(state, context);
  if (name === STATUS_CYCLE_TIMER) return onStatusCycle(state, context);
  if (name === WINDOW_DELAY_TIMER)
    return state.windowOpening
      ? onWindow({ ...state, windowOpening: false }, true, context)
      : { state, effects: [] };
  if (name === EXTERNAL_WATCH_TIMER) return onExternalLost(state, context);
  if (name === STARTUP_DONE_TIMER) {
    // The start-up status included the room temperature: the minimum interval counts from it.
    const roomC = context.objectValue(O.roomTemperature);
    if (typeof roomC !== "number") return { state, effects: [] };
    return {
      state: {
        ...state,
        roomSender: { ...state.roomSender, lastSentC: roomC, lastSentUs: context.nowUs },
      },
      effects: [],
    };
  }
  const sending = context.parameters.roomTemperatureSending;
  if (name === ROOM_SEND_TIMER) {
    const step = sendDueRoomTemperature(state.roomSender, context.nowUs, sending);
    return {
      state: { ...state, roomSender: step.state },
      effects: roomEffects(step, context),
      ...(step.sendC !== null ? { transition: "room.temperature-sent" } : {}),
    };
  }
  if (name === ROOM_CYCLE_TIMER) {
    const step = sendCyclicRoomTemperature(state.roomSender, context.nowUs);
    // Nothing to send yet (no reading): try again after a cycle; a send restarts the timer itself.
    const again: DeviceEffect[] =
      step.sendC === null
        ? [{ kind: "timer.set", name: ROOM_CYCLE_TIMER, delayUs: cycleUs(sending) }]
        : [];
    return {
      state: { ...state, roomSender: step.state },
      effects: [...roomEffects(step, context), ...again],
      ...(step.sendC !== null ? { transition: "room.temperature-sent" } : {}),
    };
  }
  return { state, effects: [] };
}

/** The HVAC gateway's pure transition: every new state rebuilt into one shape (see rebuiltGatewayState). */
export const hvacGatewayTransition = withRebuiltStates(gatewayTransition, rebuiltGatewayState);

function gatewayTransition(state: HvacGatewayState, event: DeviceEvent, context: Context): Result {
  const p = context.parameters;
  return withRoleAnnouncement(state, event, p.role, "gateway", context.links, (current) => {
    switch (event.kind) {
      case "start": {
        const effects = [
          ...periodicAnnounceEffects(p.role, "gateway", context.links),
          watchUnit(context),
          ...watchExternal(context),
          ...statusCycleEffects(context),
        ];
        if (sendsCyclically(p.roomTemperatureSending))
          effects.push({
            kind: "timer.set",
            name: ROOM_CYCLE_TIMER,
            delayUs: cycleUs(p.roomTemperatureSending),
          });
        return named({ ...current, announcedRole: p.role }, "controller.started", effects);
      }
      case "group.write":
      case "group.response":
        // Responses only reach input objects (update flag): external temperature, window contact.
        if (
          event.kind === "group.response" &&
          event.object !== O.externalRoomTemperature &&
          event.object !== O.windowContact &&
          event.object !== O.operatingMode &&
          event.object !== O.presence
        )
          return { state: current, effects: [] };
        return onWrite(current, event.object, event.value, context);
      case "link.receive": {
        const message = parseUnitLinkMessage(event.message);
        if (message?.kind !== "unit.status" && message?.kind !== "unit.alive")
          return { state: current, effects: [] };
        // A status sends the fault objects itself, with the unit's faults in them.
        const heard = unitHeard(current, context, message.kind === "unit.alive");
        if (message.kind === "unit.alive") return heard;
        const result = onUnitStatus(heard.state, message, context);
        // A restored link names the transition; what the status then sends follows from it.
        const transition = heard.transition ?? result.transition;
        return {
          state: result.state,
          effects: [...heard.effects, ...result.effects],
          ...(transition === undefined ? {} : { transition }),
        };
      }
      case "timer":
        return onTimer(current, event.name, context);
      default:
        return { state: current, effects: [] };
    }
  });
}
