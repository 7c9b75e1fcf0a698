import type { DeviceContext, DeviceEffect, DeviceEvent, TransitionResult } from "../device-type";
import { hvacFaults, type HvacFaultId } from "../hvac/fault-ids";
import {
  directionOfMode,
  modesAllowedFor,
  type HvacMode,
  type SystemDirection,
} from "../hvac/hvac-mode";
import {
  CONTROLLER_TIMEOUT_US,
  LINK_SUPERVISION_GRACE_US,
  parseUnitLinkMessage,
  UNIT_ALIVE_PERIOD_US,
  type UnitAlive,
  type UnitCommand,
  type UnitRefusal,
  type UnitStatus,
} from "../hvac/unit-link-messages";
import { FROST_BAND_K, unitSetpointC, type IndoorUnitParameters } from "./parameters";
import { rebuiltIndoorUnitState, type IndoorUnitState, type KnownController } from "./state";
import { compressorRuns, unitDrive } from "./unit-output";
import { withRebuiltStates } from "../rebuilt-states";

type Context = DeviceContext<IndoorUnitParameters>;
type Result = TransitionResult<IndoorUnitState>;

const MODEL_TIMER = "model.step";
const SUPERVISION_TIMER = "link.supervise";
const US_PER_S = 1_000_000;

/** The temperature the unit controls on: the primary gateway's external value, else its own sensor. */
export function controlTemperatureC(state: IndoorUnitState): number | null {
  if (state.externalRoomC !== null) return state.externalRoomC;
  return state.sensorOpen ? null : state.roomC;
}

/** Outdoor temperature of the unit's room (its own room's when the bench names none), °C. */
function outdoorOf(context: Context): number {
  return context.roomOutdoorC() ?? context.parameters.outdoorC;
}

/** Common practice, no published source: the filter is due after the configured fan running time. */
function filterDue(state: IndoorUnitState, context: Context): boolean {
  const hours = context.parameters.filterAlarmAfterH;
  return hours > 0 && state.filterRunS >= hours * 3600;
}

function quantize(valueC: number | null): number | null {
  return valueC === null ? null : Math.round(valueC * 100) / 100;
}

function statusMessage(
  state: IndoorUnitState,
  context: Context,
  refusal?: UnitRefusal,
): UnitStatus {
  const faults: string[] = [];
  if (state.linkFault !== null) faults.push(state.linkFault);
  if (state.sensorOpen) faults.push(hvacFaults.sensorOpen);
  return {
    kind: "unit.status",
    power: state.power,
    mode: state.mode,
    direction: directionOfMode(state.mode, state.autoDirection),
    fanLevel: state.fanLevel,
    louvrePercent: state.louvrePercent,
    setpointC: state.setpointC,
    roomC: quantize(controlTemperatureC(state)),
    faults,
    modeAuthority: state.system?.authority === context.deviceId,
    outdoorC: outdoorOf(context),
    localLocked: state.localLocked,
    filterAlarm: filterDue(state, context),
    frostProtection: state.frostActive,
    fanHeld: state.fanHeld,
    ...(state.system === null ? {} : { systemDirection: imposedDirection(state, context) }),
    ...(refusal === undefined ? {} : { refusal }),
  };
}

/** Sends the unit's status to every link it is on (controllers on its unit link, the outdoor unit on the system link). */
function report(
  state: IndoorUnitState,
  context: Context,
  refusal?: UnitRefusal,
): { state: IndoorUnitState; effects: DeviceEffect[] } {
  const message = statusMessage(state, context, refusal);
  return {
    // Rebuilt, not spread: states from every path end here (see rebuiltIndoorUnitState).
    state:
      state.reportedRoomC === message.roomC ? state : rebuiltIndoorUnitState(state, message.roomC),
    effects: context.links.map((link) => ({ kind: "link.send", link, message })),
  };
}

/**
 * Auto mode's direction: it turns only beyond the cycling band's edge plus the
 * auto hysteresis, so the overshoot of a compressor stopping at the band's
 * edge never turns a heating unit into a cooling one.
 */
function resolveAutoDirection(state: IndoorUnitState, context: Context): IndoorUnitState {
  const controlC = controlTemperatureC(state);
  if (controlC === null) return state;
  const p = context.parameters;
  const reachK = p.cycleBandK / 2 + p.autoHysteresisK;
  // States are copied field by field, so an unchanged direction keeps the state as it is.
  if (controlC < state.setpointC - reachK && state.autoDirection !== "heating")
    return { ...state, autoDirection: "heating" };
  if (controlC > state.setpointC + reachK && state.autoDirection !== "cooling")
    return { ...state, autoDirection: "cooling" };
  return state;
}

/**
 * The compressor decision for the state as it stands, and the room drive that
 * goes with it when the output changes: frost protection heats at full output;
 * otherwise a running unit cycles in the band around its setpoint on the
 * temperature it controls on (external or own); a held fan delivers nothing.
 */
function control(
  state: IndoorUnitState,
  context: Context,
): { state: IndoorUnitState; effects: DeviceEffect[] } {
  const direction = state.frostActive
    ? "heating"
    : state.power
      ? directionOfMode(state.mode, state.autoDirection)
      : "none";
  const controlC = controlTemperatureC(state);
  let compressorOn = false;
  if (state.frostActive) compressorOn = true;
  else if (direction !== "none" && controlC !== null)
    compressorOn = compressorRuns(
      state.compressorOn,
      direction,
      controlC,
      state.setpointC,
      context.parameters.cycleBandK,
    );
  const output: IndoorUnitState["output"] =
    !compressorOn || direction === "none" || state.fanHeld !== null
      ? "none"
      : direction === "heating"
        ? "heating"
        : !state.frostActive && state.mode === "dry"
          ? "dry"
          : "cooling";
  const next = rebuiltIndoorUnitState(state, state.reportedRoomC, compressorOn, output);
  if (output === state.output) return { state: next, effects: [] };
  return {
    state: next,
    effects: [{ kind: "room.drive", ...unitDrive(output, context.parameters.capacityW) }],
  };
}

/** The direction the outdoor unit imposes on this member: none while it holds authority or nobody does. */
function imposedDirection(state: IndoorUnitState, context: Context): SystemDirection {
  const system = state.system;
  if (system === null || system.authority === null || system.authority === context.deviceId)
    return "none";
  return system.direction;
}

/** Whether this member may run `mode` under the outdoor unit's current direction (always, on a single split or as the authority). */
function modeAllowed(state: IndoorUnitState, mode: HvacMode, context: Context): boolean {
  const system = state.system;
  if (system === null || system.authority === null || system.authority === context.deviceId)
    return true;
  return modesAllowedFor(system.direction).includes(mode);
}

function evaluateLinkFault(
  state: IndoorUnitState,
  context: Context,
  /** The controllers as just heard (an announcement); the state's own by default. */
  known: IndoorUnitState["controllers"] = state.controllers,
): { state: IndoorUnitState; effects: DeviceEffect[]; transition?: string } {
  // Runs on every announcement, so it copies the controllers only when one has gone quiet,
  // and the state only when its controllers changed.
  const oldestLiveUs = context.nowUs - CONTROLLER_TIMEOUT_US;
  let primaries = 0;
  let anyGone = false;
  for (const id in known) {
    const controller = known[id]!;
    if (controller.lastSeenUs < oldestLiveUs) anyGone = true;
    else if (controller.role === "primary") primaries++;
  }
  let controllers = known;
  if (anyGone) {
    const live: Record<string, KnownController> = {};
    for (const id in known) if (known[id]!.lastSeenUs >= oldestLiveUs) live[id] = known[id]!;
    controllers = live;
  }
  let fault: HvacFaultId | null = null;
  if (primaries >= 2) fault = hvacFaults.twoPrimaries;
  else if (primaries === 0 && state.supervising) fault = hvacFaults.noPrimary;
  // Rebuilt with the new controllers at once (not spread, then rebuilt again after the transition).
  const next =
    controllers === state.controllers
      ? state
      : rebuiltIndoorUnitState(
          state,
          state.reportedRoomC,
          state.compressorOn,
          state.output,
          controllers,
        );
  if (fault === state.linkFault) return { state: next, effects: [] };
  const effects: DeviceEffect[] = [];
  if (state.linkFault !== null) effects.push({ kind: "fault.clear", fault: state.linkFault });
  if (fault !== null) {
    const text =
      fault === hvacFaults.twoPrimaries
        ? `${primaries} controllers on the unit link are set as primary; commands stop until one is made secondary`
        : "no primary controller on the unit link: lost communication";
    effects.push({ kind: "fault.raise", fault, text });
  }
  const reported = report({ ...next, linkFault: fault }, context);
  return {
    state: reported.state,
    effects: [...effects, ...reported.effects],
    transition: fault ?? "link.fault-cleared",
  };
}

function applyCommand(
  state: IndoorUnitState,
  command: UnitCommand,
  from: string,
  context: Context,
): Result {
  const controller = state.controllers[from];
  if (state.linkFault !== null) {
    const refusal = {
      transition: "link.command-refused",
      controller: from,
      text: `command refused while ${state.linkFault} is active`,
    };
    const reported = report(state, context, refusal);
    return {
      state: reported.state,
      effects: [{ kind: "note", text: refusal.text }, ...reported.effects],
      transition: refusal.transition,
    };
  }
  // Common practice, no published source: a lock from KNX stops the local keys, not KNX itself.
  if (state.localLocked && controller?.controller === "wall-controller") {
    const refusal = {
      transition: "local.locked",
      controller: from,
      text: "wall controller keys are locked from KNX",
    };
    const reported = report(state, context, refusal);
    return {
      state: reported.state,
      effects: [{ kind: "note", text: refusal.text }, ...reported.effects],
      transition: refusal.transition,
    };
  }
  let next: IndoorUnitState = state;
  const refusals: UnitRefusal[] = [];
  if (command.localLock !== undefined && controller?.controller === "gateway")
    next = { ...next, localLocked: command.localLock };
  if (command.filterReset === true) next = { ...next, filterRunS: 0 };
  if (command.externalRoomC !== undefined) {
    // Common practice, no published source: only the primary controller may supply the room temperature.
    if (controller?.role === "primary") next = { ...next, externalRoomC: command.externalRoomC };
    else
      refusals.push({
        transition: "room.external-refused",
        controller: from,
        text: "external room temperature ignored: it is only taken from the primary controller",
      });
  }
  if (command.power !== undefined) {
    if (command.power && next.sensorOpen && next.externalRoomC === null) {
      refusals.push({
        transition: hvacFaults.sensorOpen,
        controller: from,
        text: "power on refused: the room temperature sensor is open",
      });
    } else {
      next = { ...next, power: command.power };
    }
  }
  if (command.fanLevel !== undefined) next = { ...next, fanLevel: command.fanLevel };
  if (command.louvrePercent !== undefined) next = { ...next, louvrePercent: command.louvrePercent };
  if (command.setpointC !== undefined) {
    next = {
      ...next,
      setpointC: unitSetpointC(command.setpointC, context.parameters.setpointResolutionK),
    };
  }
  if (command.mode !== undefined) {
    if (modeAllowed(next, command.mode, context)) {
      next = { ...next, mode: command.mode };
    } else {
      // Common practice, no published source: a refused member keeps an allowed mode, else falls back to fan.
      const kept: HvacMode = modeAllowed(next, next.mode, context) ? next.mode : "fan";
      next = { ...next, mode: kept };
      refusals.unshift({
        transition: "system.mode-refused",
        controller: from,
        text: `${command.mode} refused: the system is ${next.system?.direction ?? "none"} under ${next.system?.authority ?? "no one"}; running ${kept}`,
      });
    }
  }
  next = resolveAutoDirection(next, context);
  const controlled = control(next, context);
  const refusal = refusals[0];
  const reported = report(controlled.state, context, refusal);
  const notes: DeviceEffect[] = refusals.map((r) => ({ kind: "note", text: r.text }));
  return {
    state: reported.state,
    effects: [...notes, ...controlled.effects, ...reported.effects],
    transition:
      refusal?.transition ??
      (controlled.state.output !== state.output
        ? compressorTransitionName(controlled.state.output)
        : "unit.command-applied"),
  };
}

/** Whether frost protection heats after this reading: on below the minimum, off a band above it. */
function frostActiveAfter(state: IndoorUnitState, context: Context): boolean {
  const minC = context.parameters.frostProtectionC;
  const controlC = controlTemperatureC(state);
  if (minC === 0 || controlC === null) return false;
  if (state.frostActive) return controlC < minC + FROST_BAND_K;
  return controlC < minC;
}

type FanHold = Pick<IndoorUnitState, "fanHeld" | "heldUntilUs" | "wasHeating" | "nextDefrostUs">;

/** Hot start when heating begins, then defrost cycles in the cold (common practice, no published source). */
function fanHoldAt(state: IndoorUnitState, heating: boolean, context: Context): FanHold {
  const p = context.parameters;
  const now = context.nowUs;
  if (!heating) return { fanHeld: null, heldUntilUs: 0, wasHeating: false, nextDefrostUs: null };
  const every = p.defrostEveryMin * 60 * US_PER_S;
  if (!state.wasHeating)
    return {
      fanHeld: p.hotStartS > 0 ? "hot-start" : null,
      heldUntilUs: now + p.hotStartS * US_PER_S,
      wasHeating: true,
      nextDefrostUs: every > 0 ? now + every : null,
    };
  let hold: FanHold = {
    fanHeld: state.fanHeld,
    heldUntilUs: state.heldUntilUs,
    wasHeating: state.wasHeating,
    nextDefrostUs: state.nextDefrostUs,
  };
  if (hold.fanHeld !== null && now >= hold.heldUntilUs) hold = { ...hold, fanHeld: null };
  if (
    hold.fanHeld === null &&
    hold.nextDefrostUs !== null &&
    now >= hold.nextDefrostUs &&
    outdoorOf(context) < p.defrostBelowOutdoorC
  )
    hold = {
      ...hold,
      fanHeld: "defrost",
      heldUntilUs: now + p.defrostS * US_PER_S,
      nextDefrostUs: now + every,
    };
  return hold;
}

/** Names the compressor starting (per output) or stopping, for the trace. */
function compressorTransitionName(output: IndoorUnitState["output"]): string {
  return output === "none" ? "compressor.off" : `compressor.${output}`;
}

/**
 * The unit's control loop, every `modelStepS`: read the room (its own sensor),
 * update running hours, frost protection, auto direction, fan holds, then the
 * compressor decision and its room drive, and report changes.
 */
function stepModel(state: IndoorUnitState, context: Context): Result {
  const parameters = context.parameters;
  const roomC = context.roomTemperatureC() ?? state.roomC;
  const ranS = state.power ? (context.nowUs - state.lastStepUs) / US_PER_S : 0;
  const before = state.autoDirection;
  const stepped = resolveAutoDirection(
    { ...state, roomC, lastStepUs: context.nowUs, filterRunS: state.filterRunS + ranS },
    context,
  );
  const frostActive = frostActiveAfter(stepped, context);
  const frostChanged = frostActive !== state.frostActive;
  const asked = frostActive
    ? "heating"
    : state.power
      ? directionOfMode(state.mode, stepped.autoDirection)
      : "none";
  const hold = fanHoldAt(state, asked === "heating", context);
  const holdChanged = hold.fanHeld !== state.fanHeld;
  // The hold's fields written out: a second spread in one literal takes V8's generic copy.
  const controlled = control(
    {
      ...stepped,
      frostActive,
      fanHeld: hold.fanHeld,
      heldUntilUs: hold.heldUntilUs,
      wasHeating: hold.wasHeating,
      nextDefrostUs: hold.nextDefrostUs,
    },
    context,
  );
  const next = controlled.state;
  const compressorChanged = next.output !== state.output;
  const filterChanged = filterDue(next, context) !== filterDue(state, context);
  const effects: DeviceEffect[] = [
    { kind: "timer.set", name: MODEL_TIMER, delayUs: Math.round(parameters.modelStepS * US_PER_S) },
    ...controlled.effects,
  ];
  const autoSwitched = next.mode === "auto" && next.power && next.autoDirection !== before;
  if (
    !autoSwitched &&
    !filterChanged &&
    !frostChanged &&
    !holdChanged &&
    quantize(controlTemperatureC(next)) === next.reportedRoomC
  )
    return compressorChanged
      ? { state: next, effects, transition: compressorTransitionName(next.output) }
      : { state: next, effects };
  const compressorTransition = compressorChanged
    ? { transition: compressorTransitionName(next.output) }
    : {};
  const reported = report(next, context);
  return {
    state: reported.state,
    effects: [...effects, ...reported.effects],
    ...(autoSwitched
      ? { transition: "auto.direction-changed" }
      : holdChanged
        ? {
            transition: `fan.${next.fanHeld ?? state.fanHeld}-${next.fanHeld === null ? "end" : "begin"}`,
          }
        : frostChanged
          ? { transition: frostActive ? "frost.protection-on" : "frost.protection-off" }
          : filterChanged
            ? { transition: "filter.alarm" }
            : compressorTransition),
  };
}

function receive(state: IndoorUnitState, from: string, raw: unknown, context: Context): Result {
  const message = parseUnitLinkMessage(raw);
  if (message === undefined) return { state, effects: [] };
  switch (message.kind) {
    case "controller.announce": {
      // Copied key by key: a spread with a computed key takes V8's generic copy, at every announcement.
      const controllers: Record<string, KnownController> = {};
      for (const id in state.controllers) controllers[id] = state.controllers[id]!;
      controllers[from] = {
        role: message.role,
        controller: message.controller,
        lastSeenUs: context.nowUs,
      };
      return evaluateLinkFault(state, context, controllers);
    }
    case "unit.command":
      return applyCommand(state, message, from, context);
    case "system.state": {
      const next = {
        ...state,
        system: { direction: message.direction, authority: message.authority },
      };
      if (next.power && !modeAllowed(next, next.mode, context)) {
        const refusal = {
          transition: "system.mode-refused",
          controller: from,
          text: `${next.mode} no longer allowed: the system is ${message.direction} under ${message.authority ?? "no one"}; running fan`,
        };
        const reported = report({ ...next, mode: "fan" }, context, refusal);
        return {
          state: reported.state,
          effects: [{ kind: "note", text: refusal.text }, ...reported.effects],
          transition: refusal.transition,
        };
      }
      const changed =
        state.system?.direction !== message.direction ||
        state.system?.authority !== message.authority;
      if (!changed) return { state: next, effects: [] };
      const reported = report(next, context);
      return {
        state: reported.state,
        effects: reported.effects,
        transition: "system.state-changed",
      };
    }
    case "unit.status":
    case "unit.alive":
      // Another indoor unit on a shared system link; not ours to act on.
      return { state, effects: [] };
  }
}

/** The indoor unit's pure transition: every new state rebuilt into one shape (see rebuiltIndoorUnitState). */
export const indoorUnitTransition = withRebuiltStates(unitTransition, rebuiltIndoorUnitState);

function unitTransition(state: IndoorUnitState, event: DeviceEvent, context: Context): Result {
  switch (event.kind) {
    case "start": {
      const roomC = context.roomTemperatureC() ?? state.roomC;
      // Auto starts in the direction the room it actually reads needs (a bench room's own start temperature).
      const autoDirection = roomC < state.setpointC ? "heating" : "cooling";
      const controlled = control(
        { ...state, roomC, autoDirection, lastStepUs: context.nowUs },
        context,
      );
      const reported = report(controlled.state, context);
      return {
        state: reported.state,
        effects: [
          {
            kind: "timer.set",
            name: MODEL_TIMER,
            delayUs: Math.round(context.parameters.modelStepS * US_PER_S),
          },
          { kind: "timer.set", name: SUPERVISION_TIMER, delayUs: LINK_SUPERVISION_GRACE_US },
          ...controlled.effects,
          ...reported.effects,
        ],
        transition: "unit.started",
      };
    }
    case "timer":
      if (event.name === MODEL_TIMER) return stepModel(state, context);
      if (event.name === SUPERVISION_TIMER) {
        const evaluated = evaluateLinkFault(
          state.supervising ? state : { ...state, supervising: true },
          context,
        );
        const alive: UnitAlive = { kind: "unit.alive" };
        return {
          ...evaluated,
          effects: [
            { kind: "timer.set", name: SUPERVISION_TIMER, delayUs: UNIT_ALIVE_PERIOD_US },
            ...context.links.map((link): DeviceEffect => ({
              kind: "link.send",
              link,
              message: alive,
            })),
            ...evaluated.effects,
          ],
        };
      }
      return { state, effects: [] };
    case "link.receive":
      return receive(state, event.from, event.message, context);
    case "fault.inject":
    case "fault.clear": {
      if (event.fault !== hvacFaults.sensorOpen) return { state, effects: [] };
      const open = event.kind === "fault.inject";
      if (open === state.sensorOpen) return { state, effects: [] };
      // Common practice, no published source: with its sensor open and no external value the unit stops.
      const stops = open && state.externalRoomC === null;
      const reported = report(
        { ...state, sensorOpen: open, power: stops ? false : state.power },
        context,
      );
      return { ...reported, transition: open ? hvacFaults.sensorOpen : "unit.sensor-restored" };
    }
    case "group.write":
    case "group.response":
    case "button":
    case "input":
      return { state, effects: [] };
  }
}
