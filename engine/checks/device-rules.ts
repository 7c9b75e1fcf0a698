import { formatIndividualAddress, parseIndividualAddress } from "../address";
import type { BenchCheckRule } from "./bench-check-rule";
import type { CheckFinding } from "./check-finding";

/**
 * Two devices with one individual address answer each other's management
 * traffic and make the sender of a telegram ambiguous. The test tool's address
 * counts as a device here.
 */
export const deviceDuplicateIndividualAddressRule: BenchCheckRule = {
  id: "device.duplicate-individual-address",
  severity: "error",
  title: "Two devices share an individual address",
  check(view) {
    const holders = new Map<number, string[]>();
    const add = (text: string | undefined, who: string) => {
      if (text === undefined) return;
      const parsed = parseIndividualAddress(text);
      if (!parsed.ok) return;
      holders.set(parsed.value, [...(holders.get(parsed.value) ?? []), who]);
    };
    add(view.bench.testToolAddress, "the test tool");
    for (const device of view.bench.devices) add(device.individualAddress, device.id);
    const findings: CheckFinding[] = [];
    for (const [raw, who] of holders) {
      if (who.length < 2) continue;
      const devices = who.filter((w) => w !== "the test tool");
      findings.push({
        rule: this.id,
        severity: this.severity,
        message: `individual address ${formatIndividualAddress(raw)} is used by ${who.join(" and ")}`,
        location: { device: devices[devices.length - 1] },
      });
    }
    return findings;
  },
};

/** A device of a type the catalogue does not know cannot be simulated. */
export const deviceUnknownTypeRule: BenchCheckRule = {
  id: "device.unknown-type",
  severity: "error",
  title: "A device names a type the catalogue does not have",
  check(view) {
    const findings: CheckFinding[] = [];
    for (const [id, entry] of view.devices) {
      if (entry.type !== undefined) continue;
      findings.push({
        rule: this.id,
        severity: this.severity,
        message: `${entry.device.name} (${id}) has type "${entry.device.type}", which is not in the device catalogue`,
        location: { device: id },
      });
    }
    return findings;
  },
};

/** Parameters the device type refuses; the type's own message names the field. */
export const deviceParametersInvalidRule: BenchCheckRule = {
  id: "device.parameters-invalid",
  severity: "error",
  title: "A device's parameters do not pass its type's schema",
  check(view) {
    const findings: CheckFinding[] = [];
    for (const [id, entry] of view.devices) {
      if (entry.type === undefined || entry.parametersValid) continue;
      const parsed = entry.type.parameters.safeParse(entry.device.parameters);
      if (parsed.success) continue;
      for (const issue of parsed.error.issues) {
        const parameter = issue.path.map(String).join(".");
        findings.push({
          rule: this.id,
          severity: this.severity,
          message: `${entry.device.name} (${id}): ${parameter ? `${parameter}: ` : ""}${issue.message}`,
          location: { device: id, ...(parameter ? { parameter } : {}) },
        });
      }
    }
    return findings;
  },
};
