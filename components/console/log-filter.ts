import type { LogRow } from "@/components/sim/sim-protocol";
import { formatVirtualTime } from "./format-time";

/** What the telegram log shows; empty fields match everything. */
export interface LogFilter {
  /** Group or individual address, matched as a prefix ("2/0" matches 2/0/1). */
  readonly address: string;
  readonly deviceId: string;
  /**
   * "GroupValue_Write", "GroupValue_Read", "GroupValue_Response", "fault",
   * "coupler" (what couplers passed on, held or dropped), or "" for all.
   */
  readonly service: string;
  /** Line address ("1.2"): telegrams on that line and coupler actions heard there; "" for all. */
  readonly line: string;
  /** Free text in any column, case-insensitive. */
  readonly text: string;
}

export const emptyLogFilter: LogFilter = {
  address: "",
  deviceId: "",
  service: "",
  text: "",
  line: "",
};

export function isEmptyFilter(filter: LogFilter): boolean {
  return (
    filter.address === "" &&
    filter.deviceId === "" &&
    filter.service === "" &&
    filter.text === "" &&
    filter.line === ""
  );
}

/** Returns a predicate for rows; built once per filter change, run per row. */
export function logRowMatcher(filter: LogFilter): (row: LogRow) => boolean {
  const address = filter.address.trim();
  const text = filter.text.trim().toLowerCase();
  return (row) => {
    if (address !== "" && !row.destination.startsWith(address) && !row.source.startsWith(address))
      return false;
    if (filter.deviceId !== "" && row.deviceId !== filter.deviceId) return false;
    if (filter.line !== "" && row.line !== filter.line) return false;
    if (filter.service === "fault") {
      if (row.kind !== "fault") return false;
    } else if (filter.service === "coupler") {
      if (row.coupler === undefined) return false;
    } else if (filter.service !== "" && row.service !== filter.service) return false;
    if (text !== "") {
      const haystack =
        `${row.source} ${row.destination} ${row.destinationName} ${row.service} ${row.value} ${row.rawHex}`.toLowerCase();
      if (!haystack.includes(text)) return false;
    }
    return true;
  };
}

const CSV_COLUMNS = [
  "time",
  "line",
  "source",
  "device",
  "destination",
  "name",
  "service",
  "value",
  "priority",
  "repeated",
  "ack",
  "raw",
  "coupler",
  // Individual address of the KNXnet/IP tunnel the telegram came in over; last, so older columns keep their place.
  "tunnel",
] as const;

/**
 * A text a spreadsheet would run as a formula when the CSV is opened: it starts with
 * =, +, @, a tab or a carriage return, or with - unless it is a plain signed number
 * with an optional unit ("-5.00 °C"). Values come from outside too (a KNXnet/IP
 * client writes any DPT 16 text), so such a field gets a leading apostrophe, which
 * spreadsheets show as text (OWASP, "CSV Injection").
 */
const FORMULA_START = /^(?:[=+@\t\r]|-(?!\d+(?:\.\d+)?(?: [^=+\-@\t\r]*)?$))/;

function csvField(raw: string): string {
  const value = FORMULA_START.test(raw) ? `'${raw}` : raw;
  return /[",\n\r]/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
}

/** "forwarded by lc-1 onto line 1.0", "dropped by lc-1 for 1.2: filter", or "" when no coupler took part. */
export function couplerText(row: LogRow): string {
  const c = row.coupler;
  if (c === undefined) return "";
  if (c.action === "forward") return `forwarded by ${c.id} onto line ${c.toLine}`;
  if (c.action === "hold") return `held by ${c.id} for line ${c.toLine}`;
  return `dropped by ${c.id} for line ${c.toLine}${c.reason ? `: ${c.reason}` : ""}`;
}

/** The rows as CSV (RFC 4180 quoting), one header line, CRLF line ends. */
export function logRowsToCsv(rows: Iterable<LogRow>): string {
  const lines = [CSV_COLUMNS.join(",")];
  for (const row of rows) {
    lines.push(
      [
        formatVirtualTime(row.timeUs),
        row.line,
        row.source,
        row.deviceId,
        row.destination,
        row.destinationName,
        row.service,
        row.value,
        row.priority,
        row.repeated ? "yes" : "no",
        row.ack,
        row.rawHex,
        couplerText(row),
        row.tunnel ?? "",
      ]
        .map(csvField)
        .join(","),
    );
  }
  return lines.join("\r\n") + "\r\n";
}

/**
 * The filtered log as positions into the ring, kept up to date incrementally:
 * each update scans only the rows added since the last one and forgets rows
 * the ring has dropped, so a filter on a 100,000-row log costs per batch, not
 * per row kept. Positions are absolute (counted from the first row ever).
 */
export class FilteredLog {
  private positions: number[] = [];
  private head = 0;
  private scannedTotal = 0;
  private readonly matches: (row: LogRow) => boolean;

  constructor(readonly filter: LogFilter) {
    this.matches = logRowMatcher(filter);
  }

  /** Brings the view up to date with the ring; returns the number of matching rows. */
  update(log: { readonly total: number; readonly length: number; at(i: number): LogRow }): number {
    const firstKept = log.total - log.length;
    if (log.total < this.scannedTotal) {
      // The ring was cleared (a new run): start over.
      this.positions = [];
      this.head = 0;
      this.scannedTotal = 0;
    }
    for (let position = Math.max(this.scannedTotal, firstKept); position < log.total; position++) {
      if (this.matches(log.at(position - firstKept))) this.positions.push(position);
    }
    this.scannedTotal = log.total;
    while (this.head < this.positions.length && this.positions[this.head]! < firstKept) this.head++;
    if (this.head > 4096 && this.head * 2 > this.positions.length) {
      this.positions = this.positions.slice(this.head);
      this.head = 0;
    }
    return this.positions.length - this.head;
  }

  /** Index into the ring of the i-th matching row. */
  ringIndex(i: number, log: { readonly total: number; readonly length: number }): number {
    return this.positions[this.head + i]! - (log.total - log.length);
  }
}
