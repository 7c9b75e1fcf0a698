import type { BenchCheckRule } from "./bench-check-rule";
import type { BenchView } from "./bench-view";
import type { CheckFinding } from "./check-finding";

/**
 * Rules of the HVAC family. They read the unit links (the wired links between
 * controllers, indoor units and outdoor units), so they count per indoor unit
 * across every link it sits on: an indoor unit on its controller link and on
 * its refrigerant-system link is one unit, not two.
 */

/** Controller types whose `role` parameter takes part in the one-primary rule. */
const CONTROLLER_TYPES: readonly string[] = ["hvac-gateway", "wall-controller"];

const typeOf = (view: BenchView, id: string) => view.devices.get(id)?.device.type;
const nameOf = (view: BenchView, id: string) =>
  `${view.devices.get(id)?.device.name ?? id} (${id})`;

/** Devices of `type` that share at least one unit link with `id`, in bench order. */
function neighbours(view: BenchView, id: string, types: readonly string[]): string[] {
  const found = new Set<string>();
  for (const link of view.bench.unitLinks)
    if (link.members.includes(id))
      for (const member of link.members) {
        const type = typeOf(view, member);
        if (member !== id && type !== undefined && types.includes(type)) found.add(member);
      }
  return [...found];
}

/** The first unit link a device sits on, for the editor to highlight. */
const firstLinkOf = (view: BenchView, id: string) =>
  view.bench.unitLinks.find((link) => link.members.includes(id))?.id;

function devicesOfType(view: BenchView, type: string): string[] {
  return [...view.devices].filter(([, entry]) => entry.device.type === type).map(([id]) => id);
}

const isPrimary = (view: BenchView, id: string) =>
  view.devices.get(id)?.parameters.role === "primary";

function unitFinding(
  view: BenchView,
  rule: BenchCheckRule,
  unit: string,
  message: string,
): CheckFinding {
  const link = firstLinkOf(view, unit);
  return {
    rule: rule.id,
    severity: rule.severity,
    message,
    location: link === undefined ? { device: unit } : { device: unit, unitLink: link },
  };
}

/**
 * One indoor unit accepts exactly one primary controller; a second primary
 * produces a communication fault until one is set secondary (common practice,
 * no published source; knx-reference.md "Trade practice"). The unit stops
 * taking commands, so the bench misbehaves: an error. A lab that teaches the
 * fault switches a controller to primary during its scenario instead.
 */
export const indoorUnitTwoPrimariesRule: BenchCheckRule = {
  id: "indoor-unit.two-primaries",
  severity: "error",
  title: "An indoor unit has more than one primary controller",
  check(view) {
    return devicesOfType(view, "indoor-unit").flatMap((unit) => {
      const primaries = neighbours(view, unit, CONTROLLER_TYPES).filter((id) =>
        isPrimary(view, id),
      );
      if (primaries.length < 2) return [];
      return [
        unitFinding(
          view,
          this,
          unit,
          `${nameOf(view, unit)} has ${primaries.length} primary controllers across its unit links: ${primaries.map((id) => nameOf(view, id)).join(" and ")}; the unit raises link.two-primaries and stops taking commands until only one is primary`,
        ),
      ];
    });
  },
};

/** Controllers but none primary: the unit reports lost communication (same source as above). */
export const indoorUnitNoPrimaryRule: BenchCheckRule = {
  id: "indoor-unit.no-primary",
  severity: "warning",
  title: "An indoor unit has controllers but none is primary",
  check(view) {
    return devicesOfType(view, "indoor-unit").flatMap((unit) => {
      const controllers = neighbours(view, unit, CONTROLLER_TYPES);
      if (controllers.length === 0 || controllers.some((id) => isPrimary(view, id))) return [];
      return [
        unitFinding(
          view,
          this,
          unit,
          `${nameOf(view, unit)} has no primary controller (${controllers.map((id) => nameOf(view, id)).join(", ")} are secondary); it will report link.no-primary`,
        ),
      ];
    });
  },
};

/** An indoor unit nobody controls only runs on what the bench preset. */
export const indoorUnitNoControllerRule: BenchCheckRule = {
  id: "indoor-unit.no-controller",
  severity: "warning",
  title: "An indoor unit shares no unit link with a gateway or wall controller",
  check(view) {
    return devicesOfType(view, "indoor-unit").flatMap((unit) =>
      neighbours(view, unit, CONTROLLER_TYPES).length > 0
        ? []
        : [
            unitFinding(
              view,
              this,
              unit,
              `${nameOf(view, unit)} has no gateway or wall controller on its unit links, so nothing on KNX can command it`,
            ),
          ],
    );
  },
};

/** One refrigerant circuit per indoor unit: a unit piped to two outdoor units is a wiring mistake. */
export const indoorUnitSeveralOutdoorUnitsRule: BenchCheckRule = {
  id: "indoor-unit.several-outdoor-units",
  severity: "error",
  title: "An indoor unit sits on more than one outdoor unit",
  check(view) {
    return devicesOfType(view, "indoor-unit").flatMap((unit) => {
      const outdoor = neighbours(view, unit, ["outdoor-unit"]);
      if (outdoor.length < 2) return [];
      return [
        unitFinding(
          view,
          this,
          unit,
          `${nameOf(view, unit)} is on ${outdoor.length} outdoor units (${outdoor.map((id) => nameOf(view, id)).join(", ")}); an indoor unit belongs to one refrigerant system`,
        ),
      ];
    });
  },
};

function controllerRule(
  id: string,
  severity: BenchCheckRule["severity"],
  title: string,
  test: (view: BenchView, controller: string, units: readonly string[]) => string | undefined,
  parameter?: string,
): BenchCheckRule {
  return {
    id,
    severity,
    title,
    check(view) {
      const findings: CheckFinding[] = [];
      for (const [controller, entry] of view.devices) {
        if (!CONTROLLER_TYPES.includes(entry.device.type)) continue;
        const message = test(view, controller, neighbours(view, controller, ["indoor-unit"]));
        if (message === undefined) continue;
        findings.push({
          rule: id,
          severity,
          message,
          location:
            parameter === undefined ? { device: controller } : { device: controller, parameter },
        });
      }
      return findings;
    },
  };
}

/** A controller on no indoor unit commands nothing. */
export const controllerNoUnitRule = controllerRule(
  "controller.no-unit",
  "warning",
  "A gateway or wall controller shares no unit link with an indoor unit",
  (view, controller, units) =>
    units.length === 0
      ? `${nameOf(view, controller)} shares no unit link with an indoor unit, so its commands go nowhere`
      : undefined,
);

/** A gateway or wall controller serves one indoor unit (common practice, no published source). */
export const controllerSeveralUnitsRule = controllerRule(
  "controller.several-units",
  "error",
  "A gateway or wall controller is wired to several indoor units",
  (view, controller, units) =>
    units.length > 1
      ? `${nameOf(view, controller)} is wired to ${units.length} indoor units (${units.map((id) => nameOf(view, id)).join(", ")}); a controller serves one unit`
      : undefined,
);

const systemTypeOf = (view: BenchView, controller: string) =>
  view.devices.get(controller)?.parameters.systemType;
const onOutdoorUnit = (view: BenchView, unit: string) =>
  neighbours(view, unit, ["outdoor-unit"]).length > 0;

/**
 * A gateway set to multi-split whose unit is on no outdoor unit waits for a
 * mode authority that never comes.
 */
export const gatewayMultiSplitWithoutOutdoorUnitRule = controllerRule(
  "gateway.multi-split-without-outdoor-unit",
  "warning",
  "A gateway set to multi-split controls a unit on no outdoor unit",
  (view, controller, units) => {
    const unit = units[0];
    if (units.length !== 1 || unit === undefined) return undefined;
    if (systemTypeOf(view, controller) !== "multi-split" || onOutdoorUnit(view, unit))
      return undefined;
    return `${nameOf(view, controller)} is set to multi-split but ${nameOf(view, unit)} is on no outdoor unit; it has no mode authority to report`;
  },
  "systemType",
);

/**
 * A gateway set to single split on a unit that shares an outdoor unit has no
 * mode-authority object, so a refused mode is invisible on KNX (common
 * practice, no published source: on a multi-split one unit holds mode authority).
 */
export const gatewaySingleSplitOnOutdoorUnitRule = controllerRule(
  "gateway.single-split-on-outdoor-unit",
  "warning",
  "A gateway set to single split controls a unit on a shared outdoor unit",
  (view, controller, units) => {
    const unit = units[0];
    if (units.length !== 1 || unit === undefined) return undefined;
    if (systemTypeOf(view, controller) !== "single-split" || !onOutdoorUnit(view, unit))
      return undefined;
    return `${nameOf(view, controller)} is set to single split but ${nameOf(view, unit)} shares an outdoor unit; it has no mode-authority status, so a mode the outdoor unit refuses is not visible on KNX`;
  },
  "systemType",
);

/**
 * A gateway may take an external room temperature only while it is the primary
 * (common practice, no published source; knx-reference.md "Trade practice").
 */
export const gatewayExternalTemperatureOnSecondaryRule: BenchCheckRule = {
  id: "gateway.external-temperature-on-secondary",
  severity: "error",
  title: "A secondary gateway is set to use an external room temperature",
  check(view) {
    const findings: CheckFinding[] = [];
    for (const [id, entry] of view.devices) {
      if (entry.device.type !== "hvac-gateway") continue;
      if (
        entry.parameters.role !== "secondary" ||
        entry.parameters.roomTemperatureSource !== "external"
      )
        continue;
      findings.push({
        rule: this.id,
        severity: this.severity,
        message: `${entry.device.name} (${id}) is a secondary controller but takes the room temperature from KNX; only the primary may supply an external room temperature`,
        location: { device: id, parameter: "roomTemperatureSource" },
      });
    }
    return findings;
  },
};

/**
 * An outdoor unit set to follow a leader must name an indoor unit on its own
 * refrigerant system; otherwise nobody ever holds mode authority and the
 * members heat and cool against each other.
 */
export const outdoorUnitLeaderNotMemberRule: BenchCheckRule = {
  id: "outdoor-unit.leader-not-member",
  severity: "error",
  title: "An outdoor unit's leader is not one of its indoor units",
  check(view) {
    return devicesOfType(view, "outdoor-unit").flatMap((outdoor) => {
      const p = view.devices.get(outdoor)?.parameters;
      if (p?.modeAuthority !== "leader" || typeof p.leaderUnit !== "string") return [];
      if (neighbours(view, outdoor, ["indoor-unit"]).includes(p.leaderUnit)) return [];
      return [
        {
          rule: this.id,
          severity: this.severity,
          message: `${nameOf(view, outdoor)} follows leader "${p.leaderUnit}", which is not an indoor unit on its refrigerant system, so no unit ever holds mode authority`,
          location: { device: outdoor, parameter: "leaderUnit" },
        },
      ];
    });
  },
};
