import { z } from "zod";
import type {
  DeviceContext,
  DeviceEffect,
  DeviceEvent,
  DeviceType,
  TransitionResult,
} from "../device-type";
import type { SystemDirection } from "../hvac/hvac-mode";
import {
  parseUnitLinkMessage,
  type SystemState,
  type UnitStatus,
} from "../hvac/unit-link-messages";

/**
 * Who decides the system's direction (common practice, no published source; the
 * three arrangements multi-split and multi-zone systems are sold with):
 * - "first-request": the first member that heats or cools holds mode authority
 *   until it stops; the others may only run compatible modes.
 * - "leader": one indoor unit (`leaderUnit`) decides; while it heats or cools the
 *   others follow, while it is off or only moves air they are free.
 * - "heat-recovery": the outdoor unit moves heat between members, so each picks
 *   its own mode and nobody holds authority.
 */
export const outdoorUnitParametersSchema = z
  .object({
    modeAuthority: z.enum(["first-request", "leader", "heat-recovery"]).default("first-request"),
    /** Device id of the leading indoor unit, for "leader". */
    leaderUnit: z.string().min(1).optional(),
  })
  .superRefine((value, context) => {
    if (value.modeAuthority === "leader" && value.leaderUnit === undefined)
      context.addIssue({
        code: "custom",
        path: ["leaderUnit"],
        message: "leaderUnit names the indoor unit that decides (modeAuthority leader)",
      });
  });
export type OutdoorUnitParameters = z.infer<typeof outdoorUnitParametersSchema>;

export interface OutdoorUnitState {
  /** What each indoor unit on the system link last said it runs. */
  readonly members: Readonly<Record<string, { readonly direction: SystemDirection }>>;
  readonly authority: string | null;
  readonly direction: SystemDirection;
}

type Context = DeviceContext<OutdoorUnitParameters>;
type Result = TransitionResult<OutdoorUnitState>;

function broadcast(state: OutdoorUnitState, context: Context): DeviceEffect[] {
  const message: SystemState = {
    kind: "system.state",
    direction: state.direction,
    authority: state.authority,
  };
  return context.links.map((link) => ({ kind: "link.send", link, message }));
}

/**
 * Who holds mode authority after `from` reported: the holder keeps it while it
 * heats or cools; when it stops, the reporting member takes it if it heats or
 * cools, else the first other such member by id (stable, so runs replay).
 * Common practice, no published source.
 */
function electAuthority(
  members: OutdoorUnitState["members"],
  current: string | null,
  from: string,
): string | null {
  if (current !== null && isMoving(members, current)) return current;
  if (isMoving(members, from)) return from;
  // The first by sorted id, found without sorting a copy at every status: `<` on strings
  // orders by UTF-16 code units, as the default sort does.
  let first: string | null = null;
  for (const id in members) if (isMoving(members, id) && (first === null || id < first)) first = id;
  return first;
}

/** Whether a member heats or cools (a plain function: this runs on every status report). */
function isMoving(members: OutdoorUnitState["members"], id: string): boolean {
  return (members[id]?.direction ?? "none") !== "none";
}

function onStatus(
  state: OutdoorUnitState,
  from: string,
  status: UnitStatus,
  context: Context,
): Result {
  const memberDirection: SystemDirection = status.power ? status.direction : "none";
  // Members mostly repeat what they run; the table is copied only when one changed.
  const members =
    state.members[from]?.direction === memberDirection
      ? state.members
      : { ...state.members, [from]: { direction: memberDirection } };
  const p = context.parameters;
  const authority =
    p.modeAuthority === "heat-recovery"
      ? null
      : p.modeAuthority === "leader"
        ? (members[p.leaderUnit!]?.direction ?? "none") === "none"
          ? null
          : p.leaderUnit!
        : electAuthority(members, state.authority, from);
  const direction = authority === null ? "none" : (members[authority]?.direction ?? "none");
  const next: OutdoorUnitState = { members, authority, direction };
  if (authority !== state.authority || direction !== state.direction) {
    const text = `mode authority ${authority ?? "free"}, system ${direction}`;
    return {
      state: next,
      effects: [{ kind: "note", text }, ...broadcast(next, context)],
      transition:
        authority !== state.authority ? "system.authority-changed" : "system.direction-changed",
    };
  }
  // Two members may ask at once before either heard the other; the one without authority is told again.
  const conflicting =
    from !== authority &&
    memberDirection !== "none" &&
    direction !== "none" &&
    memberDirection !== direction;
  if (conflicting)
    return {
      state: next,
      effects: broadcast(next, context),
      transition: "system.conflict-corrected",
    };
  return { state: next, effects: [] };
}

function outdoorUnitTransition(
  state: OutdoorUnitState,
  event: DeviceEvent,
  context: Context,
): Result {
  if (event.kind === "start")
    return { state, effects: broadcast(state, context), transition: "system.started" };
  if (event.kind !== "link.receive") return { state, effects: [] };
  const message = parseUnitLinkMessage(event.message);
  if (message?.kind !== "unit.status") return { state, effects: [] };
  return onStatus(state, event.from, message, context);
}

/**
 * Outdoor unit of a multi-split system: one refrigerant cycle shared by several
 * indoor units, so one member holds mode authority and the others may only run
 * modes compatible with its direction (heat or fan while heating; cool, fan or
 * dry while cooling). It tells the members with `system.state` messages; each
 * indoor unit refuses what its direction does not allow.
 */
export const outdoorUnitType: DeviceType<OutdoorUnitParameters, OutdoorUnitState> = {
  id: "outdoor-unit",
  label: "Outdoor unit",
  description:
    "Shared outdoor unit of a multi-split system; grants mode authority to one indoor unit. Not on KNX.",
  medium: "unit-link",
  parameters: outdoorUnitParametersSchema,
  groupObjects: () => [],
  buttons: () => [],
  initialState: () => ({ members: {}, authority: null, direction: "none" }),
  transition: outdoorUnitTransition,
};
