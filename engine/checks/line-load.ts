import { telegramOccupancyUs, tp1FrameOctets } from "../frame";
import type { BenchCheckRule } from "./bench-check-rule";
import type { BenchView, DeviceView } from "./bench-view";
import type { CheckFinding } from "./check-finding";
import { childPath, walkParameterObjects } from "./walk-parameters";
import { blockedOnPath, deviceLineId, topologyView } from "./topology-view";
import { formatLineAddress } from "../topology/line-address";

/**
 * Expected steady bus load from the sending conditions devices are configured
 * with, per line. This is an estimate for planning, not a simulation: every
 * condition is taken at its worst case.
 *
 * - A room-temperature sending block (`mode`, `minIntervalS`, `cycleS`, shared by
 *   the HVAC family) sends cyclically once per `cycleS`, and on change at most once
 *   per `minIntervalS` (once per sample period when the interval is 0; one sample
 *   per second unless the device names its period). Room temperature is DPT 9.001,
 *   2 octets, so an 11-octet frame.
 * - Any other positive parameter named like `cyclicS`, `cycleS` or `sendCycleS`
 *   sends once per period; taken as a short (1-bit-sized, 9-octet) frame, the
 *   usual size of a cyclic heartbeat or presence/contact status.
 *
 * Each telegram holds the line for its occupancy: idle 50 + 13 per octet + ack gap
 * 15 + ack 11 bit times (Basic course; engine/frame/timing.ts), so a 9-octet frame
 * takes 193 bit times ≈ 20.1 ms and a line carries about 50 such telegrams/s.
 *
 * On a bench with couplers a line also carries what couplers pass into it: a
 * device's sending conditions count on every other line that a telegram on one
 * of the addresses it sends on reaches through the couplers' settings and
 * filter tables (worst case again: any of its sending addresses).
 */

const ROOM_TEMPERATURE_OCTETS = tp1FrameOctets({ payload: new Uint8Array(2), shortPayload: false });
const SHORT_OCTETS = tp1FrameOctets({ payload: new Uint8Array(1), shortPayload: true });
const SENDING_MODES: readonly string[] = ["off", "on-change", "cyclic", "on-change-and-cyclic"];
const CYCLIC_KEY = /^(cyclic|cycle|sendCycle)[A-Za-z]*S$/;
const SAMPLE_PERIOD_KEYS: readonly string[] = ["samplePeriodS", "sampleS", "modelStepS"];
const DEFAULT_SAMPLE_PERIOD_S = 1;

/** One configured sending condition and the load it brings. */
export interface LoadContribution {
  readonly device: string;
  /** Parameter path of the condition ("roomTemperatureSending", "cyclicS"). */
  readonly parameter: string;
  readonly telegramsPerSecond: number;
  /** Frame octets assumed for each telegram. */
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

function samplePeriodS(parameters: Record<string, unknown>): number {
  for (const key of SAMPLE_PERIOD_KEYS) {
    const value = parameters[key];
    if (typeof value === "number" && value > 0) return value;
  }
  return DEFAULT_SAMPLE_PERIOD_S;
}

function contribution(
  device: string,
  parameter: string,
  telegramsPerSecond: number,
  octets: number,
  basis: string,
): LoadContribution {
  const loadPercent = (telegramsPerSecond * telegramOccupancyUs(octets)) / 10_000;
  return { device, parameter, telegramsPerSecond, octets, loadPercent, basis };
}

/** The sending conditions of one device, each with its worst-case rate. */
export function deviceLoadContributions(id: string, entry: DeviceView): LoadContribution[] {
  const found: LoadContribution[] = [];
  walkParameterObjects(entry.parameters, (object, path) => {
    const mode = object.mode;
    if (
      typeof mode === "string" &&
      SENDING_MODES.includes(mode) &&
      typeof object.minIntervalS === "number" &&
      typeof object.cycleS === "number"
    ) {
      const cyclic = mode === "cyclic" || mode === "on-change-and-cyclic";
      const onChange = mode === "on-change" || mode === "on-change-and-cyclic";
      if (cyclic && object.cycleS > 0) {
        found.push(
          contribution(
            id,
            childPath(path, "cycleS"),
            1 / object.cycleS,
            ROOM_TEMPERATURE_OCTETS,
            `cyclic every ${object.cycleS} s`,
          ),
        );
      }
      if (onChange) {
        const periodS =
          object.minIntervalS > 0 ? object.minIntervalS : samplePeriodS(entry.parameters);
        const basis =
          object.minIntervalS > 0
            ? `on change, at most every ${object.minIntervalS} s`
            : `on change with no minimum interval, up to one per ${periodS} s sample`;
        found.push(
          contribution(
            id,
            childPath(path, "minIntervalS"),
            1 / periodS,
            ROOM_TEMPERATURE_OCTETS,
            basis,
          ),
        );
      }
      return;
    }
    for (const [key, value] of Object.entries(object)) {
      if (!CYCLIC_KEY.test(key) || typeof value !== "number" || value <= 0) continue;
      found.push(
        contribution(id, childPath(path, key), 1 / value, SHORT_OCTETS, `cyclic every ${value} s`),
      );
    }
  });
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
    const own = deviceLoadContributions(id, entry);
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
