import { getDpt, payloadOctets } from "../dpt";
import type { SendingCondition } from "../devices/device-type";
import { telegramOccupancyUs, tp1FrameOctets } from "../frame";
import type { BenchCheckRule } from "./bench-check-rule";
import type { BenchView, DeviceView } from "./bench-view";
import type { CheckFinding } from "./check-finding";
import { blockedOnPath, deviceLineId, topologyView } from "./topology-view";
import { formatLineAddress } from "../topology/line-address";

/**
 * Expected steady bus load from the sending conditions devices are configured
 * with, per line. This is an estimate for planning, not a simulation: every
 * condition is taken at its worst case.
 *
 * What a device sends on its own comes from its type's `sendingConditions` hook
 * (engine/devices/device-type.ts): cyclic sending, a status heartbeat, on-change
 * sending paced by a minimum interval. No rule here names a device type or reads
 * parameter names, so a new cyclic device counts by declaring its conditions.
 * Each condition sends its objects once per period; an object counts when it can
 * send (communication and transmit flags) and has a sending address, since an
 * unlinked object puts nothing on the bus. Its frame size follows its DPT
 * (9 octets for a datapoint of 6 bits or less, else 8 + 1 + the payload octets).
 *
 * Bus time per telegram (engine/frame/timing.ts, `telegramOccupancyUs`): the line
 * is idle 50 bit times before the frame, each octet is a character of 13 bit times
 * (start, 8 data, parity, stop, 2 pause), the acknowledgement follows after 15 bit
 * times and is 11 bits long, at 9600 bit/s. That is the KNX basic course's own
 * breakdown of a short telegram (50 + 9 × 13 + 15 + 11 = 193 bit times, about 20.1
 * ms), with the timing values of KNX Standard 08_02_02 (TP1 conformance) §10.1.2;
 * both are listed in design/knx-reference.md, "TP1 timing". So a line carries on
 * the order of 50 short telegrams per second at full load (derived, not a published
 * limit), and the percentage here is that occupancy over one second.
 *
 * On a bench with couplers a line also carries what couplers pass into it: a
 * device's sending conditions count on every other line that a telegram on one
 * of the addresses it sends on reaches through the couplers' settings and
 * filter tables (worst case again: any of its sending addresses).
 */

/** One configured sending condition and the load it brings. */
export interface LoadContribution {
  readonly device: string;
  /** Parameter path of the condition ("roomTemperatureSending.minIntervalS", "statusCycleS"). */
  readonly parameter: string;
  readonly telegramsPerSecond: number;
  /** Frame octets assumed for each telegram (the largest, when the condition sends several objects). */
  readonly octets: number;
  /** Share of line capacity, percent. */
  readonly loadPercent: number;
  /** How the rate was derived, for the finding's message. */
  readonly basis: string;
  /** Set when couplers pass it into the line: the line id the device sits on. */
  readonly forwardedFrom?: string;
}

export interface LineLoadEstimate {
  readonly line: string;
  readonly telegramsPerSecond: number;
  readonly loadPercent: number;
  readonly contributions: readonly LoadContribution[];
}

/** TP1 frame octets of a telegram carrying `dpt` (a short frame for an unknown DPT). */
function frameOctets(dpt: string): number {
  const sizeBits = getDpt(dpt)?.sizeBits ?? 1;
  const short = sizeBits <= 6;
  return tp1FrameOctets({
    payload: new Uint8Array(short ? 0 : payloadOctets(sizeBits)),
    shortPayload: short,
  });
}

/** The device's own conditions; a type that cannot read these parameters declares none. */
function conditionsOf(entry: DeviceView): readonly SendingCondition[] {
  const hook = entry.type?.sendingConditions;
  if (hook === undefined) return [];
  try {
    return hook(entry.parameters);
  } catch {
    // Parameters that do not parse are reported by their own rule; the estimate skips them.
    return [];
  }
}

/** The sending conditions of one device, each with its worst-case rate on its line. */
export function deviceLoadContributions(
  view: BenchView,
  id: string,
  entry: DeviceView,
): LoadContribution[] {
  const found: LoadContribution[] = [];
  for (const condition of conditionsOf(entry)) {
    if (!(condition.periodS > 0) || !Number.isFinite(condition.periodS)) continue;
    let telegrams = 0;
    let occupiedUs = 0;
    let octets = 0;
    for (const number of condition.objects) {
      const spec = entry.objects.find((o) => o.number === number);
      if (spec === undefined || !spec.flags.communication || !spec.flags.transmit) continue;
      if (view.linksOf(id, number).length === 0) continue;
      const frame = frameOctets(spec.dpt);
      telegrams++;
      occupiedUs += telegramOccupancyUs(frame);
      octets = Math.max(octets, frame);
    }
    if (telegrams === 0) continue;
    found.push({
      device: id,
      parameter: condition.parameter,
      telegramsPerSecond: telegrams / condition.periodS,
      octets,
      // occupied µs per second as a percentage of 1,000,000 µs
      loadPercent: occupiedUs / condition.periodS / 10_000,
      basis: telegrams > 1 ? `${condition.basis}, ${telegrams} objects` : condition.basis,
    });
  }
  return found;
}

/** Expected load per line from the devices' sending conditions. Devices only on a unit link send nothing on KNX. */
export function estimateLineLoad(view: BenchView): LineLoadEstimate[] {
  const perLine = new Map<string, LoadContribution[]>();
  for (const line of view.bench.lines) perLine.set(line.id, []);
  for (const [id, entry] of view.devices) {
    if (entry.type?.medium === "unit-link" || entry.device.individualAddress === undefined)
      continue;
    const line = deviceLineId(view, entry);
    if (line === undefined) continue;
    const own = deviceLoadContributions(view, id, entry);
    perLine.set(line, [...(perLine.get(line) ?? []), ...own]);
    if (own.length > 0) addForwarded(view, perLine, id, line, own);
  }
  return [...perLine].map(([line, contributions]) => ({
    line,
    contributions,
    telegramsPerSecond: contributions.reduce((sum, c) => sum + c.telegramsPerSecond, 0),
    loadPercent: contributions.reduce((sum, c) => sum + c.loadPercent, 0),
  }));
}

const round = (value: number, digits: number) => Number(value.toFixed(digits));

export const lineExpectedLoadRule: BenchCheckRule = {
  id: "line.expected-load",
  severity: "warning",
  title: "Configured sending would load a line beyond the bound",
  check(view, options) {
    const findings: CheckFinding[] = [];
    for (const estimate of estimateLineLoad(view)) {
      if (estimate.loadPercent <= options.loadWarnPercent) continue;
      const severity = estimate.loadPercent > options.loadErrorPercent ? "error" : "warning";
      const bound = severity === "error" ? options.loadErrorPercent : options.loadWarnPercent;
      const top = [...estimate.contributions]
        .sort((a, b) => b.loadPercent - a.loadPercent)
        .slice(0, 3)
        .map(
          (c) =>
            `${c.device} ${c.parameter} (${c.basis}: ${round(c.telegramsPerSecond, 2)}/s, ${round(c.loadPercent, 1)} %)`,
        )
        .join("; ");
      findings.push({
        rule: this.id,
        severity,
        message: `line ${estimate.line}: configured sending adds up to ${round(estimate.telegramsPerSecond, 1)} telegrams/s, about ${round(estimate.loadPercent, 1)} % of the line's capacity (bound ${bound} %); largest: ${top}`,
        location: { line: estimate.line },
      });
    }
    return findings;
  },
};

/** Adds `own` (a device's contributions on `line`) to every other line its telegrams reach through couplers. */
function addForwarded(
  view: BenchView,
  perLine: Map<string, LoadContribution[]>,
  device: string,
  line: string,
  own: readonly LoadContribution[],
): void {
  const topology = topologyView(view);
  if (topology.couplers.length === 0) return;
  const from = topology.lineAddress.get(line);
  const sends = topology.sendsOn.get(device) ?? [];
  if (from === undefined || sends.length === 0) return;
  for (const [other, to] of topology.lineAddress) {
    if (other === line || to === from) continue;
    if (!sends.some((raw) => blockedOnPath(topology, raw, from, to) === undefined)) continue;
    const forwarded = own.map((c) => ({
      ...c,
      basis: `${c.basis}, passed in by couplers from line ${formatLineAddress(from)}`,
      forwardedFrom: line,
    }));
    perLine.set(other, [...(perLine.get(other) ?? []), ...forwarded]);
  }
}
