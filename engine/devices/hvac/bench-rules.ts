import { err, ok, type Result } from "../../core/result";
import { hvacGatewayParametersSchema } from "../hvac-gateway/parameters";
import { wallControllerParametersSchema } from "../wall-controller/parameters";
import type { ControllerRole } from "./unit-link-messages";

/**
 * Bench rules of the HVAC family, for the bench loader and the bench checks.
 * They need the whole bench (parameters of several devices and the unit links
 * between them), so they cannot live in one device type's parameter schema.
 *
 * The input is the part of a bench document these rules read; a `Bench` or
 * `BenchInput` from engine/bench (or a loaded bench's `bench`) fits as it is.
 */
export interface HvacBenchInput {
  readonly devices?: readonly {
    readonly id: string;
    readonly type: string;
    readonly parameters?: unknown;
  }[];
  readonly unitLinks?: readonly { readonly id: string; readonly members: readonly string[] }[];
}

/** Rule ids of our own, one per finding kind. */
export type HvacRuleId =
  | "hvac.external-temperature-on-secondary"
  | "hvac.two-primaries"
  | "hvac.no-primary"
  | "hvac.unit-without-controller"
  | "hvac.controller-without-unit"
  | "hvac.controller-several-units"
  | "hvac.unit-several-outdoor-units"
  | "hvac.multi-split-without-outdoor-unit"
  | "hvac.single-split-on-outdoor-unit"
  | "hvac.parameters-invalid";

export interface HvacBenchFinding {
  readonly rule: HvacRuleId;
  /** Errors make the bench unusable; warnings describe a bench that runs into a fault (often on purpose, in a lab). */
  readonly severity: "error" | "warning";
  readonly message: string;
  /** JSON path in the bench document, e.g. "devices[3].parameters.roomTemperatureSource". */
  readonly path: string;
  readonly device?: string;
  readonly unitLink?: string;
}

interface Controller {
  readonly id: string;
  readonly index: number;
  readonly kind: "hvac-gateway" | "wall-controller";
  readonly role: ControllerRole;
  readonly systemType?: "single-split" | "multi-split";
}

/** Every finding, errors and warnings, in a stable order (bench order of devices, then links). */
export function checkHvacBench(bench: HvacBenchInput): HvacBenchFinding[] {
  const findings: HvacBenchFinding[] = [];
  const devices = bench.devices ?? [];
  const controllers: Controller[] = [];
  const typeOf = new Map(devices.map((device) => [device.id, device.type]));
  devices.forEach((device, index) => {
    if (device.type !== "hvac-gateway" && device.type !== "wall-controller") return;
    const schema =
      device.type === "hvac-gateway" ? hvacGatewayParametersSchema : wallControllerParametersSchema;
    const parsed = schema.safeParse(device.parameters ?? {});
    if (!parsed.success) {
      const issue = parsed.error.issues[0];
      const field = issue?.path.map(String).join(".") ?? "";
      findings.push({
        rule: "hvac.parameters-invalid",
        severity: "error",
        message: `${device.id}: ${issue?.message ?? "invalid parameters"}`,
        path: `devices[${index}].parameters${field === "" ? "" : `.${field}`}`,
        device: device.id,
      });
      return;
    }
    const role = parsed.data.role;
    if (device.type === "hvac-gateway" && "roomTemperatureSource" in parsed.data) {
      const gateway = parsed.data;
      // Common practice, no published source: only the primary may supply the room temperature.
      if (gateway.roomTemperatureSource === "external" && role === "secondary") {
        findings.push({
          rule: "hvac.external-temperature-on-secondary",
          severity: "error",
          message: `${device.id}: an external room temperature is only allowed on a primary gateway; make it primary or use the unit's sensor`,
          path: `devices[${index}].parameters.roomTemperatureSource`,
          device: device.id,
        });
      }
      controllers.push({
        id: device.id,
        index,
        kind: "hvac-gateway",
        role,
        systemType: gateway.systemType,
      });
    } else {
      controllers.push({ id: device.id, index, kind: "wall-controller", role });
    }
  });

  const links = bench.unitLinks ?? [];
  const neighbours = (id: string, type: string) => {
    const found = new Set<string>();
    for (const link of links)
      if (link.members.includes(id))
        for (const member of link.members)
          if (member !== id && typeOf.get(member) === type) found.add(member);
    return [...found];
  };
  const unitPath = (unit: string) => {
    const linkIndex = links.findIndex((link) => link.members.includes(unit));
    return linkIndex < 0
      ? `devices[${devices.findIndex((d) => d.id === unit)}]`
      : `unitLinks[${linkIndex}].members`;
  };

  for (const controller of controllers) {
    const units = neighbours(controller.id, "indoor-unit");
    const path = `devices[${controller.index}]`;
    if (units.length === 0) {
      findings.push({
        rule: "hvac.controller-without-unit",
        severity: "warning",
        message: `${controller.id} shares no unit link with an indoor unit`,
        path,
        device: controller.id,
      });
    } else if (units.length > 1) {
      findings.push({
        rule: "hvac.controller-several-units",
        severity: "error",
        message: `${controller.id} shares unit links with several indoor units (${units.join(", ")}); a controller serves one unit`,
        path,
        device: controller.id,
      });
    }
    const unit = units[0];
    if (controller.systemType === undefined || unit === undefined || units.length > 1) continue;
    const outdoor = neighbours(unit, "outdoor-unit").length > 0;
    if (controller.systemType === "multi-split" && !outdoor) {
      findings.push({
        rule: "hvac.multi-split-without-outdoor-unit",
        severity: "warning",
        message: `${controller.id} is set to multi-split but ${unit} is on no outdoor unit`,
        path: `${path}.parameters.systemType`,
        device: controller.id,
      });
    }
    if (controller.systemType === "single-split" && outdoor) {
      findings.push({
        rule: "hvac.single-split-on-outdoor-unit",
        severity: "warning",
        message: `${controller.id} is set to single split but ${unit} shares an outdoor unit; it will have no mode-authority status`,
        path: `${path}.parameters.systemType`,
        device: controller.id,
      });
    }
  }

  devices.forEach((device) => {
    if (device.type !== "indoor-unit") return;
    const own = controllers.filter((controller) =>
      neighbours(device.id, controller.kind).includes(controller.id),
    );
    const primaries = own.filter((controller) => controller.role === "primary");
    const path = unitPath(device.id);
    if (own.length === 0) {
      findings.push({
        rule: "hvac.unit-without-controller",
        severity: "warning",
        message: `${device.id} has no gateway or wall controller on its unit link`,
        path,
        device: device.id,
      });
    } else if (primaries.length >= 2) {
      // Common practice, no published source: one primary per indoor unit; the run shows link.two-primaries.
      findings.push({
        rule: "hvac.two-primaries",
        severity: "warning",
        message: `${device.id} has ${primaries.length} primary controllers (${primaries.map((c) => c.id).join(", ")}); it will report link.two-primaries until one is secondary`,
        path,
        device: device.id,
      });
    } else if (primaries.length === 0) {
      findings.push({
        rule: "hvac.no-primary",
        severity: "warning",
        message: `${device.id} has no primary controller; it will report link.no-primary`,
        path,
        device: device.id,
      });
    }
    const outdoorUnits = neighbours(device.id, "outdoor-unit");
    if (outdoorUnits.length > 1) {
      findings.push({
        rule: "hvac.unit-several-outdoor-units",
        severity: "error",
        message: `${device.id} is on several outdoor units (${outdoorUnits.join(", ")})`,
        path,
        device: device.id,
      });
    }
  });
  return findings;
}

/**
 * The bench loader's gate: ok with the warnings when no rule fails, else the errors.
 * Call it with the validated bench document: `validateHvacBench(bench)`.
 */
export function validateHvacBench(
  bench: HvacBenchInput,
): Result<readonly HvacBenchFinding[], readonly HvacBenchFinding[]> {
  const findings = checkHvacBench(bench);
  const errors = findings.filter((finding) => finding.severity === "error");
  return errors.length > 0 ? err(errors) : ok(findings);
}
