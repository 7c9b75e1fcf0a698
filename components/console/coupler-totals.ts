import {
  COUPLER_TYPE_ID,
  couplerLines,
  formatLineAddress,
  parseIndividualAddress,
  type BenchSummary,
  type CouplerTotals,
} from "@/engine";

/** Drops that mean something went wrong; a filter-table or block-all drop is a coupler doing its job. */
export const FAULTY_DROP_REASONS: ReadonlySet<string> = new Set([
  "queue-full",
  "not-acknowledged",
  "hop-count",
]);

/** How the console names a drop reason (the log's words, spelled out). */
const REASON_LABEL: Readonly<Record<string, string>> = {
  filter: "not in filter table",
  blocked: "blocked by setting",
  "hop-count": "routing counter used up",
  "queue-full": "buffer full",
  "not-acknowledged": "not acknowledged",
};

/** One coupler as the couplers panel lists it. */
export interface CouplerTotalsRow {
  readonly id: string;
  readonly name: string;
  /** Its individual address ("1.2.0"), "" when it has none. */
  readonly address: string;
  /** The two lines it joins, lower first ("1.2 – 1.0"), "" when the address does not say. */
  readonly joins: string;
  readonly forwarded: number;
  readonly held: number;
  readonly dropped: number;
  /** Drops by reason, largest first, for people ("not in filter table 3, buffer full 1"); "" without drops. */
  readonly droppedDetail: string;
  /** True when any drop means something went wrong (buffer full, not acknowledged, routing counter). */
  readonly faulty: boolean;
}

/**
 * The couplers of the bench with their running totals, in bench order. A
 * coupler the session has not reported yet shows zeros rather than vanishing.
 */
export function couplerTotalsRows(
  bench: BenchSummary | null,
  totals: readonly CouplerTotals[],
): CouplerTotalsRow[] {
  if (bench === null) return [];
  const byId = new Map(totals.map((t) => [t.id, t]));
  return bench.devices
    .filter((device) => device.type === COUPLER_TYPE_ID)
    .map((device) => {
      const total = byId.get(device.id);
      const drops = Object.entries(total?.dropped ?? {}).filter(([, count]) => count > 0);
      drops.sort((a, b) => b[1] - a[1]);
      return {
        id: device.id,
        name: device.name,
        address: device.individualAddress ?? "",
        joins: joinsOf(device.individualAddress),
        forwarded: total?.forwarded ?? 0,
        held: total?.held ?? 0,
        dropped: drops.reduce((sum, [, count]) => sum + count, 0),
        droppedDetail: drops
          .map(([reason, count]) => `${REASON_LABEL[reason] ?? reason} ${count}`)
          .join(", "),
        faulty: drops.some(([reason]) => FAULTY_DROP_REASONS.has(reason)),
      };
    });
}

function joinsOf(individualAddress: string | null): string {
  if (individualAddress === null) return "";
  const parsed = parseIndividualAddress(individualAddress);
  if (!parsed.ok) return "";
  const lines = couplerLines(parsed.value);
  return lines === undefined
    ? ""
    : `${formatLineAddress(lines.lower)} – ${formatLineAddress(lines.upper)}`;
}
