import { formatIndividualAddress, parseIndividualAddress } from "../address";
import { COUPLER_TYPE_ID } from "../devices/coupler/coupler";
import { mustCross } from "../topology/filter-table";
import { formatLineAddress, upperLineAddress } from "../topology/line-address";
import type { BenchCheckRule } from "./bench-check-rule";
import type { CheckFinding } from "./check-finding";
import { describeAddress } from "./describe-member";
import { blockedOnPath, topologyView } from "./topology-view";

/**
 * Topology rules: couplers that stop a group address its members need across
 * them, filter-table entries nothing needs, devices addressed for another
 * line, and lines beyond the standard's size. Line limits (knx-reference.md,
 * Topology; Basic course): 64 devices per line segment on one bus supply, up
 * to 4 segments per line with line repeaters (256 devices; marked from memory
 * in knx-reference.md), 15 lines per area and 15 areas. The last two cannot be
 * exceeded in a bench: a line address is "area.line" with both 0..15.
 */

/** Devices on one line segment (knx-reference.md, Topology, Basic course). */
export const DEVICES_PER_SEGMENT = 64;
/** Segments per line with line repeaters (knx-reference.md, Topology: from memory, check the Basic course). */
export const SEGMENTS_PER_LINE = 4;

export const topologyFilterBlocksRule: BenchCheckRule = {
  id: "topology.filter-blocks",
  severity: "error",
  title: "A coupler between a group address's sender and listener does not pass it",
  check(view) {
    const topology = topologyView(view);
    const findings: CheckFinding[] = [];
    const reported = new Set<string>();
    for (const [raw, use] of topology.uses) {
      const address = view.addresses.get(raw);
      const text = address?.text ?? String(raw);
      for (const from of use.senders) {
        for (const to of use.listeners) {
          if (from === to) continue;
          const blocked = blockedOnPath(topology, raw, from, to);
          if (blocked === undefined) continue;
          const key = `${raw}#${blocked.kind === "no-coupler" ? `line ${blocked.lower}` : blocked.coupler.id}`;
          if (reported.has(key)) continue;
          reported.add(key);
          const what = describeAddress(text, address?.name);
          const route = `a sender on line ${formatLineAddress(from)} and a listener on line ${formatLineAddress(to)}`;
          if (blocked.kind === "no-coupler") {
            const upper = upperLineAddress(blocked.lower);
            findings.push({
              rule: this.id,
              severity: "warning",
              message: `${what} has ${route}, but no coupler joins line ${formatLineAddress(blocked.lower)} to line ${formatLineAddress(upper ?? 0)}: its telegrams stay on their line`,
              location: { groupAddress: text, line: topology.lineId.get(blocked.lower) },
            });
            continue;
          }
          const coupler = blocked.coupler;
          findings.push({
            rule: this.id,
            severity: this.severity,
            message:
              blocked.kind === "blocked"
                ? `coupler ${coupler.name} (${coupler.id}) blocks all group telegrams, but ${what} has ${route} across it`
                : `coupler ${coupler.name} (${coupler.id}) has no entry ${text} in its filter table, but ${what} has ${route} across it: add ${text} to the table or regenerate it`,
            location: { device: coupler.id, groupAddress: text, parameter: "filterTable" },
          });
        }
      }
    }
    return findings;
  },
};

export const topologyFilterUnusedRule: BenchCheckRule = {
  id: "topology.filter-unused",
  severity: "info",
  title: "A stored filter table holds an address nothing needs across the coupler",
  check(view) {
    const topology = topologyView(view);
    const findings: CheckFinding[] = [];
    for (const coupler of topology.couplers) {
      coupler.storedTable?.forEach((entry, index) => {
        const use = topology.uses.get(entry.raw);
        if (use !== undefined && mustCross(use, coupler.lowerLine)) return;
        findings.push({
          rule: this.id,
          severity: this.severity,
          message: `coupler ${coupler.name} (${coupler.id}) passes ${entry.text}, but no sender on one side of it has a listener on the other`,
          location: {
            device: coupler.id,
            groupAddress: entry.text,
            parameter: `filterTable[${index}]`,
          },
        });
      });
    }
    return findings;
  },
};

export const topologyAddressWrongLineRule: BenchCheckRule = {
  id: "topology.address-wrong-line",
  severity: "error",
  title: "A device's individual address does not belong to its line",
  check(view) {
    const topology = topologyView(view);
    const findings: CheckFinding[] = [];
    for (const [id, line] of topology.deviceLine) {
      const entry = view.devices.get(id)!;
      const parsed = parseIndividualAddress(entry.device.individualAddress!);
      const lineAddress = topology.lineAddress.get(line);
      if (!parsed.ok || lineAddress === undefined) continue;
      const own = parsed.value >> 8;
      const message =
        own !== lineAddress
          ? `${entry.device.name} (${id}) has individual address ${entry.device.individualAddress}, which belongs to line ${formatLineAddress(own)}, but sits on line ${formatLineAddress(lineAddress)} ("${line}")`
          : (parsed.value & 0xff) === 0 && entry.type?.id !== COUPLER_TYPE_ID
            ? `${entry.device.name} (${id}) has individual address ${formatIndividualAddress(parsed.value)}, the address of line ${formatLineAddress(own)}'s coupler (device number 0 is the coupler's; knx-reference.md, Topology)`
            : undefined;
      if (message !== undefined)
        findings.push({
          rule: this.id,
          severity: this.severity,
          message,
          location: { device: id, line },
        });
    }
    return findings;
  },
};

export const topologyLineLimitsRule: BenchCheckRule = {
  id: "topology.line-limits",
  severity: "warning",
  title: "More devices on a line than a segment, or than a line with repeaters, carries",
  check(view) {
    const topology = topologyView(view);
    const counts = new Map<string, number>();
    for (const line of topology.deviceLine.values()) counts.set(line, (counts.get(line) ?? 0) + 1);
    const findings: CheckFinding[] = [];
    for (const [line, count] of counts) {
      if (count <= DEVICES_PER_SEGMENT) continue;
      const address = formatLineAddress(topology.lineAddress.get(line) ?? 0);
      const most = DEVICES_PER_SEGMENT * SEGMENTS_PER_LINE;
      findings.push({
        rule: this.id,
        // Beyond what repeaters can carry is an error; needing repeaters the bench does not model, a warning.
        severity: count > most ? "error" : this.severity,
        message:
          count > most
            ? `line ${address} ("${line}") has ${count} devices: more than ${most}, the most a line carries with ${SEGMENTS_PER_LINE} segments of ${DEVICES_PER_SEGMENT} (line repeaters); split it into more lines`
            : `line ${address} ("${line}") has ${count} devices: more than ${DEVICES_PER_SEGMENT} on one segment, so it needs ${Math.ceil(count / DEVICES_PER_SEGMENT)} segments joined by line repeaters (not modelled: the bench runs it as one segment)`,
        location: { line },
      });
    }
    return findings;
  },
};
