import type { BenchCheckRule } from "./bench-check-rule";
import type { CheckFinding } from "./check-finding";
import { describeObject } from "./describe-member";

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
