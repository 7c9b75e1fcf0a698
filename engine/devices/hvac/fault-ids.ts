/**
 * Descriptive fault identifiers of the HVAC family (never letter-digit codes),
 * with the short text a gateway puts on its DPT 16.000 fault text object.
 */
export const hvacFaults = {
  /** Two controllers on one unit link are both set as primary; the unit stops taking commands. */
  twoPrimaries: "link.two-primaries",
  /** No controller on the unit link is the primary; the unit reports lost communication. */
  noPrimary: "link.no-primary",
  /** The indoor unit's own room temperature sensor reads open circuit; the unit stops. */
  sensorOpen: "unit.sensor-open",
  /** The gateway has heard nothing from its indoor unit for its supervision time (wiring broken, unit unpowered). */
  unitLost: "gateway.unit-lost",
  /** The external room temperature stopped arriving; the unit controls on its own sensor meanwhile. */
  externalTemperatureLost: "gateway.external-temperature-lost",
} as const;

export type HvacFaultId = (typeof hvacFaults)[keyof typeof hvacFaults];

/** Faults that stop the unit from taking commands from its controllers. */
export const linkFaults: readonly string[] = [hvacFaults.twoPrimaries, hvacFaults.noPrimary];

// DPT spec §3 (16.000): 14 octets of ASCII, so every text here is at most 14 characters.
const faultText: Readonly<Record<string, string>> = {
  [hvacFaults.twoPrimaries]: "two primaries",
  [hvacFaults.noPrimary]: "no primary",
  [hvacFaults.sensorOpen]: "sensor open",
  [hvacFaults.unitLost]: "unit lost",
  [hvacFaults.externalTemperatureLost]: "ext temp lost",
};

/** Maximum characters of a DPT 16.000 string (14 octets). */
export const FAULT_TEXT_MAX_CHARS = 14;

/** Short ASCII text (at most 14 characters) for a fault id; unknown ids are cut to fit. */
export function faultDisplayText(fault: string): string {
  return (faultText[fault] ?? fault).slice(0, FAULT_TEXT_MAX_CHARS);
}
