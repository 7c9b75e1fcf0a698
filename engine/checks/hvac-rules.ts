import type { BenchCheckRule } from "./bench-check-rule";
import type { CheckFinding } from "./check-finding";
import { childPath, walkParameterObjects } from "./walk-parameters";

/** Controller types whose `role` parameter takes part in the one-primary rule. */
const CONTROLLER_TYPES: readonly string[] = ["hvac-gateway", "wall-controller"];

/**
 * One indoor unit accepts exactly one primary controller on its wired link; a
 * second primary produces a communication fault until one is set secondary
 * (common practice, no published source; knx-reference.md "Trade practice").
 */
export const unitLinkTwoPrimariesRule: BenchCheckRule = {
  id: "unit-link.two-primaries",
  severity: "error",
  title: "A unit link has more than one primary controller",
  check(view) {
    const findings: CheckFinding[] = [];
    for (const link of view.bench.unitLinks) {
      const primaries = link.members.filter((member) => {
        const entry = view.devices.get(member);
        return (
          entry !== undefined &&
          CONTROLLER_TYPES.includes(entry.device.type) &&
          entry.parameters.role === "primary"
        );
      });
      if (primaries.length < 2) continue;
      const names = primaries
        .map((id) => `${view.devices.get(id)?.device.name ?? id} (${id})`)
        .join(" and ");
      findings.push({
        rule: this.id,
        severity: this.severity,
        message: `unit link ${link.name ? `"${link.name}" ` : ""}(${link.id}) has ${primaries.length} primary controllers: ${names}; the unit stops taking commands until only one is primary`,
        location: { unitLink: link.id, device: primaries[1] },
      });
    }
    return findings;
  },
};

/** A unit link with controllers but no primary: the unit reports lost communication. */
export const unitLinkNoPrimaryRule: BenchCheckRule = {
  id: "unit-link.no-primary",
  severity: "warning",
  title: "A unit link has controllers but none is primary",
  check(view) {
    const findings: CheckFinding[] = [];
    for (const link of view.bench.unitLinks) {
      const controllers = link.members.filter((member) => {
        const entry = view.devices.get(member);
        return entry !== undefined && CONTROLLER_TYPES.includes(entry.device.type);
      });
      if (controllers.length === 0) continue;
      if (controllers.some((id) => view.devices.get(id)?.parameters.role === "primary")) continue;
      findings.push({
        rule: this.id,
        severity: this.severity,
        message: `unit link ${link.name ? `"${link.name}" ` : ""}(${link.id}) has no primary controller; the unit will report lost communication`,
        location: { unitLink: link.id },
      });
    }
    return findings;
  },
};

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
 * Setpoint limits where the minimum is not below the maximum leave no setpoint
 * to accept. Looks for every `setpointMinC` / `setpointMaxC` pair in the
 * written parameters (the naming the HVAC controllers share).
 */
export const setpointLimitsInvertedRule: BenchCheckRule = {
  id: "setpoint.limits-inverted",
  severity: "error",
  title: "Setpoint limits are inverted",
  check(view) {
    const findings: CheckFinding[] = [];
    for (const [id, entry] of view.devices) {
      walkParameterObjects(entry.parameters, (object, path) => {
        const min = object.setpointMinC;
        const max = object.setpointMaxC;
        if (typeof min !== "number" || typeof max !== "number" || min < max) return;
        findings.push({
          rule: this.id,
          severity: this.severity,
          message: `${entry.device.name} (${id}): setpointMinC ${min} °C is not below setpointMaxC ${max} °C, so no setpoint can be accepted`,
          location: { device: id, parameter: childPath(path, "setpointMinC") },
        });
      });
    }
    return findings;
  },
};
