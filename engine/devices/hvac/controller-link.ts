import type { DeviceEffect } from "../device-type";
import { linkFaults } from "./fault-ids";
import { CONTROLLER_ANNOUNCE_PERIOD_US, type ControllerAnnounce, type ControllerRole, type UnitStatus } from "./unit-link-messages";

/** Timer name controllers use for their periodic announcement. */
export const ANNOUNCE_TIMER = "link.announce";

/** Announce `role` on every link the controller is on. */
export function announceEffects(role: ControllerRole, controller: ControllerAnnounce["controller"], links: readonly string[]): DeviceEffect[] {
  const message: ControllerAnnounce = { kind: "controller.announce", role, controller };
  return links.map((link) => ({ kind: "link.send", link, message }));
}

/** Announce now and again after one period; a role changed in the bench reaches the unit within a period. */
export function periodicAnnounceEffects(role: ControllerRole, controller: ControllerAnnounce["controller"], links: readonly string[]): DeviceEffect[] {
  return [...announceEffects(role, controller, links), { kind: "timer.set", name: ANNOUNCE_TIMER, delayUs: CONTROLLER_ANNOUNCE_PERIOD_US }];
}

/**
 * The link faults a controller shows, raised and cleared as the unit's status changes,
 * so each controller's own fault list (its display, the gateway's fault objects) follows the unit.
 */
export function linkFaultEffects(before: readonly string[], status: UnitStatus): { effects: DeviceEffect[]; changed: string | undefined } {
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
