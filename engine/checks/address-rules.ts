import { dptSizeBits } from "../dpt";
import type { BenchCheckRule } from "./bench-check-rule";
import type { AddressView } from "./bench-view";
import type { CheckFinding } from "./check-finding";
import { describeAddress, describeMember } from "./describe-member";

const sends = (address: AddressView) =>
  address.members.filter(
    (m) => m.sending && m.spec !== undefined && m.spec.flags.communication && m.spec.flags.transmit,
  );
const listens = (address: AddressView) =>
  address.members.filter(
    (m) =>
      m.spec !== undefined &&
      m.spec.flags.communication &&
      (m.spec.flags.write || m.spec.flags.update),
  );

/**
 * Objects of different sizes on one address cannot understand each other: a
 * receiver decodes the payload with its own DPT (DPT spec §1.3.1: datapoints up
 * to 6 bits travel in the APCI octet, longer ones after it).
 */
export const addressMixedSizesRule: BenchCheckRule = {
  id: "address.mixed-sizes",
  severity: "error",
  title: "A group address links objects of different sizes",
  check(view) {
    const findings: CheckFinding[] = [];
    for (const address of view.addresses.values()) {
      const sized = address.members
        .filter((m) => m.spec !== undefined)
        .map((m) => ({ member: m, dpt: m.spec!.dpt, bits: dptSizeBits(m.spec!.dpt) }));
      const sizes = new Set(sized.map((s) => s.bits));
      if (sizes.size < 2) continue;
      const list = sized
        .map((s) => `${describeMember(view, s.member)} is ${s.dpt} (${s.bits ?? "?"} bit)`)
        .join("; ");
      findings.push({
        rule: this.id,
        severity: this.severity,
        message: `${describeAddress(address.text, address.name)} links objects of different sizes: ${list}`,
        location: { groupAddress: address.text },
      });
    }
    return findings;
  },
};

/**
 * An address that objects listen to, but that no object sends on (as its first,
 * sending link with the transmit flag), only changes when a person sends from
 * the test tool.
 */
export const addressNoSenderRule: BenchCheckRule = {
  id: "address.no-sender",
  severity: "warning",
  title: "A group address has listeners but no object sends on it",
  check(view) {
    const findings: CheckFinding[] = [];
    for (const address of view.addresses.values()) {
      if (address.members.length === 0 || sends(address).length > 0) continue;
      const heard = listens(address);
      if (heard.length === 0) continue;
      findings.push({
        rule: this.id,
        severity: this.severity,
        message: `${describeAddress(address.text, address.name)} has no sender: ${heard.map((m) => describeMember(view, m)).join(", ")} listen, but no object sends on it (its first link with the transmit flag)`,
        location: { groupAddress: address.text },
      });
    }
    return findings;
  },
};

/**
 * A command that nobody receives does nothing. A status address that only the
 * test tool or a visualisation reads is normal, so it is reported as info; the
 * message says what it costs on the line: a frame no device acknowledges is
 * repeated up to 3 times (Basic course; KNX Standard 08_02_02 §10; see
 * design/knx-reference.md, TP1 timing), as the simulated line does too.
 */
export const addressNoListenerRule: BenchCheckRule = {
  id: "address.no-listener",
  severity: "warning",
  title: "A group address has a sender but no object listens",
  check(view) {
    const findings: CheckFinding[] = [];
    for (const address of view.addresses.values()) {
      // A toggle button listens on its own sending address; it does not hear itself.
      const listeners = listens(address);
      const unheard = sends(address).filter(
        (sender) =>
          !listeners.some((l) => l.device !== sender.device || l.object !== sender.object),
      );
      if (unheard.length === 0) continue;
      const commands = unheard.filter((m) => m.spec?.role !== "status");
      findings.push({
        rule: this.id,
        severity: commands.length > 0 ? "warning" : "info",
        message:
          commands.length > 0
            ? `${describeAddress(address.text, address.name)} has no listener: ${commands.map((m) => describeMember(view, m)).join(", ")} send on it, but no object has the write or update flag`
            : `${describeAddress(address.text, address.name)} carries status only: nothing on the bench listens, so only the test tool or a visualisation sees it; on its TP1 line nothing acknowledges it either (unless a coupler there passes every group telegram), so each telegram goes out four times (the first and 3 repetitions), which is most of the load when many devices report at once after bus power returns`,
        location: { groupAddress: address.text },
      });
    }
    return findings;
  },
};

/** A declared address that no object links to; harmless, often a leftover. */
export const addressUnlinkedRule: BenchCheckRule = {
  id: "address.unlinked",
  severity: "info",
  title: "A group address is declared but linked to no object",
  check(view) {
    const findings: CheckFinding[] = [];
    for (const address of view.addresses.values()) {
      if (address.members.length > 0) continue;
      findings.push({
        rule: this.id,
        severity: this.severity,
        message: `${describeAddress(address.text, address.name)} is declared but no object is linked to it`,
        location: { groupAddress: address.text },
      });
    }
    return findings;
  },
};
