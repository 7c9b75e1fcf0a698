import type { DeviceEffect, DeviceEvent, TransitionResult } from "../device-type";
import { linkFaults } from "./fault-ids";
import {
  CONTROLLER_ANNOUNCE_PERIOD_US,
  type ControllerAnnounce,
  type ControllerRole,
  type UnitStatus,
} from "./unit-link-messages";

/** Timer name controllers use for their periodic announcement. */
export const ANNOUNCE_TIMER = "link.announce";

/** Announce `role` on every link the controller is on. */
export function announceEffects(
  role: ControllerRole,
  controller: ControllerAnnounce["controller"],
  links: readonly string[],
): DeviceEffect[] {
  const message: ControllerAnnounce = { kind: "controller.announce", role, controller };
  return links.map((link) => ({ kind: "link.send", link, message }));
}

/** Announce now and again after one period; a role changed in the bench reaches the unit within a period. */
export function periodicAnnounceEffects(
  role: ControllerRole,
  controller: ControllerAnnounce["controller"],
  links: readonly string[],
): DeviceEffect[] {
  return [
    ...announceEffects(role, controller, links),
    { kind: "timer.set", name: ANNOUNCE_TIMER, delayUs: CONTROLLER_ANNOUNCE_PERIOD_US },
  ];
}

/**
 * The link faults a controller shows, raised and cleared as the unit's status changes,
 * so each controller's own fault list (its display, the gateway's fault objects) follows the unit.
 */
export function linkFaultEffects(
  before: readonly string[],
  status: UnitStatus,
): { effects: DeviceEffect[]; changed: string | undefined } {
  const now = status.faults;
  const effects: DeviceEffect[] = [];
  let changed: string | undefined;
  for (const fault of before) {
    if (!now.includes(fault)) {
      effects.push({ kind: "fault.clear", fault });
      changed ??= "fault.cleared";
    }
  }
  for (const fault of now) {
    if (!before.includes(fault)) {
      const kind = linkFaults.includes(fault) ? "unit link" : "indoor unit";
      effects.push({ kind: "fault.raise", fault, text: `${kind} reports ${fault}` });
      changed = fault;
    }
  }
  return { effects, changed };
}

/**
 * Runs a controller's transition with its link duties around it: the periodic
 * announcement timer is answered here, and a role changed in the bench since the
 * last announcement is announced before the controller's own effects.
 * `inner` handles "start" itself (and must announce there).
 */
export function withRoleAnnouncement<S extends { readonly announcedRole: ControllerRole | null }>(
  state: S,
  event: DeviceEvent,
  role: ControllerRole,
  controller: ControllerAnnounce["controller"],
  links: readonly string[],
  inner: (state: S) => TransitionResult<S>,
): TransitionResult<S> {
  if (event.kind === "timer" && event.name === ANNOUNCE_TIMER) {
    return {
      // Announced every period with the role unchanged: keep the state rather than copy it.
      state: state.announcedRole === role ? state : { ...state, announcedRole: role },
      effects: periodicAnnounceEffects(role, controller, links),
    };
  }
  const roleChanged =
    event.kind !== "start" && state.announcedRole !== null && state.announcedRole !== role;
  const result = inner(roleChanged ? { ...state, announcedRole: role } : state);
  if (!roleChanged) return result;
  return {
    state: result.state,
    effects: [...periodicAnnounceEffects(role, controller, links), ...result.effects],
    transition: result.transition ?? "controller.role-changed",
  };
}
