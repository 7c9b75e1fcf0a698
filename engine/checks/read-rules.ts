import type { BenchCheckRule } from "./bench-check-rule";
import type { AddressMember } from "./bench-view";
import type { CheckFinding } from "./check-finding";
import { describeAddress, describeMember, describeObject } from "./describe-member";
import { formatGroupAddress } from "../address";

/** An object that answers a GroupValue_Read on any address it is linked to (as the simulation does). */
const answers = (m: AddressMember) =>
  m.spec !== undefined && m.spec.flags.communication && m.spec.flags.read;

/**
 * Every object with the read flag answers a GroupValue_Read on its address, so
 * two of them send two responses, possibly with different values, and the
 * reader keeps whichever comes last. Common practice, no published source: set
 * the read flag on one object per address, the one that holds the state.
 */
export const addressSeveralReadRespondersRule: BenchCheckRule = {
  id: "address.several-read-responders",
  severity: "warning",
  title: "More than one object answers reads on a group address",
  check(view) {
    const findings: CheckFinding[] = [];
    for (const address of view.addresses.values()) {
      const responders = address.members.filter(answers);
      if (responders.length < 2) continue;
      findings.push({
        rule: this.id,
        severity: this.severity,
        message: `${describeAddress(address.text, address.name)} has ${responders.length} objects with the read flag (${responders.map((m) => describeMember(view, m)).join(", ")}); a read gets ${responders.length} answers and the reader keeps the last, so leave the flag on the one object that holds the state`,
        location: { groupAddress: address.text },
      });
    }
    return findings;
  },
};

/**
 * A read-on-init object reads its sending address at start-up; when no other
 * object there has the read flag, nothing answers and the object starts without
 * a value (common practice, no published source).
 */
export const objectReadOnInitUnansweredRule: BenchCheckRule = {
  id: "object.read-on-init-unanswered",
  severity: "warning",
  title: "A read-on-init object reads an address nothing answers",
  check(view) {
    const findings: CheckFinding[] = [];
    for (const [id, entry] of view.devices) {
      for (const spec of entry.objects) {
        const f = spec.flags;
        // The start-up read goes to the first link; whether or not it is sent, nothing there can answer.
        if (!f.communication || !f.readOnInit) continue;
        const first = view.linksOf(id, spec.number)[0];
        if (first === undefined) continue;
        const address = view.addresses.get(first);
        const others = (address?.members ?? []).filter(
          (m) => answers(m) && !(m.device === id && m.object === spec.number),
        );
        if (others.length > 0) continue;
        const text = address
          ? describeAddress(address.text, address.name)
          : formatGroupAddress(first);
        findings.push({
          rule: this.id,
          severity: this.severity,
          message: `${describeObject(view, id, spec.number)} reads ${text} at start-up, but no other object there has the read flag, so it starts without a value`,
          location: { device: id, object: spec.number, groupAddress: address?.text },
        });
      }
    }
    return findings;
  },
};
