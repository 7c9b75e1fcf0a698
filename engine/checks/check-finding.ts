/**
 * What a bench check reports. Rule ids are Benchline's own, dotted by what they
 * look at (`address.no-sender`, `indoor-unit.two-primaries`).
 */

/** error: the bench will misbehave; warning: it probably will; info: worth knowing. */
export type CheckSeverity = "error" | "warning" | "info";

/** Where a finding is, so an editor can highlight it. Only the fields that apply are set. */
export interface CheckLocation {
  readonly device?: string;
  readonly object?: number;
  /** Group address as text ("1/0/1"). */
  readonly groupAddress?: string;
  readonly unitLink?: string;
  /** Line id from the bench. */
  readonly line?: string;
  /** Parameter path inside the device's parameters ("scenes[2].scene"). */
  readonly parameter?: string;
}

export interface CheckFinding {
  readonly rule: string;
  readonly severity: CheckSeverity;
  readonly message: string;
  readonly location: CheckLocation;
}

const SEVERITY_ORDER: Readonly<Record<CheckSeverity, number>> = { error: 0, warning: 1, info: 2 };

/** Errors first, then warnings, then info; within a severity by rule id, then by message. */
export function compareFindings(a: CheckFinding, b: CheckFinding): number {
  return (
    SEVERITY_ORDER[a.severity] - SEVERITY_ORDER[b.severity] ||
    (a.rule < b.rule ? -1 : a.rule > b.rule ? 1 : 0) ||
    (a.message < b.message ? -1 : a.message > b.message ? 1 : 0)
  );
}
