import type { BenchCheckRule } from "./bench-check-rule";
import type { CheckFinding } from "./check-finding";
import { describeAddress, describeObject } from "./describe-member";

/**
 * A status object with no group address cannot report anything: the command
 * may work, but nobody can see that it did.
 */
export const objectStatusUnlinkedRule: BenchCheckRule = {
  id: "object.status-unlinked",
  severity: "warning",
  title: "A status object has no group address",
  check(view) {
    const findings: CheckFinding[] = [];
    for (const [id, entry] of view.devices) {
      for (const spec of entry.objects) {
        if (spec.role !== "status" || !spec.flags.communication) continue;
        if (view.linksOf(id, spec.number).length > 0) continue;
        findings.push({
          rule: this.id,
          severity: this.severity,
          message: `${describeObject(view, id, spec.number)} is a status object with no group address, so its feedback goes nowhere`,
          location: { device: id, object: spec.number },
        });
      }
    }
    return findings;
  },
};

/**
 * A status object whose sending address is the sending address of a command
 * object: its feedback is written back into every command object there, so a
 * status echo becomes a command to other controllers (and a second gateway on
 * that address follows the first). Common practice, no published source: one
 * address for the command, a separate one for its status.
 */
export const objectStatusOnCommandAddressRule: BenchCheckRule = {
  id: "object.status-on-command-address",
  severity: "warning",
  title: "A status object sends on a command address",
  check(view) {
    const commandAddresses = new Set<number>();
    for (const [id, entry] of view.devices)
      for (const spec of entry.objects) {
        if (spec.role !== "command") continue;
        const first = view.linksOf(id, spec.number)[0];
        if (first !== undefined) commandAddresses.add(first);
      }
    const findings: CheckFinding[] = [];
    for (const [id, entry] of view.devices) {
      for (const spec of entry.objects) {
        if (spec.role !== "status" || !spec.flags.communication || !spec.flags.transmit) continue;
        const first = view.linksOf(id, spec.number)[0];
        if (first === undefined || !commandAddresses.has(first)) continue;
        const address = view.addresses.get(first);
        const commands = (address?.members ?? []).filter(
          (m) => m.spec?.role === "command" && m.sending,
        );
        findings.push({
          rule: this.id,
          severity: this.severity,
          message: `${describeObject(view, id, spec.number)} is a status object but sends on ${address ? describeAddress(address.text, address.name) : first}, the command address of ${commands.map((m) => describeObject(view, m.device, m.object)).join(", ")}; its feedback arrives there as a command`,
          location: { device: id, object: spec.number, groupAddress: address?.text },
        });
      }
    }
    return findings;
  },
};
