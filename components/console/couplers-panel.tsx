"use client";

import { useMemo } from "react";
import { useSimState } from "@/components/sim/sim-context";
import { cx } from "@/components/ui/cx";
import { Mono } from "@/components/ui/mono";
import { couplerTotalsRows } from "./coupler-totals";

/**
 * What each coupler has done since the run started: telegrams it forwarded
 * onto the other line, times it held one behind a busy line, and drops with
 * their reasons (the log has each one as a row). A drop that means something
 * went wrong (buffer full, not acknowledged, routing counter used up) is in
 * the fault colour; a filter-table or block-all drop is the coupler at work.
 */
export function CouplersPanel() {
  const bench = useSimState((s) => s.bench);
  const totals = useSimState((s) => s.couplers);
  const rows = useMemo(() => couplerTotalsRows(bench, totals), [bench, totals]);
  if (rows.length === 0)
    return <p className="text-xs text-ink-soft">This bench has no couplers.</p>;
  return (
    <div className="overflow-x-auto rounded-md border border-paper-line bg-white">
      <table className="w-full text-left text-xs" aria-label="Coupler totals since the run started">
        <thead className="bg-paper-deep text-ink-soft">
          <tr>
            <th scope="col" className="px-2 py-1 font-medium">
              Coupler
            </th>
            <th
              scope="col"
              className="px-2 py-1 font-medium"
              title="The line below, then the line above"
            >
              Joins lines
            </th>
            <th
              scope="col"
              className="px-2 py-1 text-right font-medium"
              title="Telegrams the coupler sent on onto the other line"
            >
              Forwarded
            </th>
            <th
              scope="col"
              className="px-2 py-1 text-right font-medium"
              title="Times the coupler queued a telegram while the other line was busy"
            >
              Held
            </th>
            <th
              scope="col"
              className="px-2 py-1 text-right font-medium"
              title="Telegrams not passed on that someone beyond the coupler listens to"
            >
              Dropped
            </th>
          </tr>
        </thead>
        <tbody>
          {rows.map((row) => (
            <tr
              key={row.id}
              className="border-t border-paper-line"
              data-testid={`coupler-totals-${row.id}`}
            >
              <th scope="row" className="px-2 py-1 text-left font-normal">
                <Mono className="text-copper-deep">{row.address}</Mono> {row.name}
              </th>
              <td className="px-2 py-1">
                <Mono>{row.joins}</Mono>
              </td>
              <td className="px-2 py-1 text-right tabular-nums">{row.forwarded}</td>
              <td className="px-2 py-1 text-right tabular-nums">{row.held}</td>
              <td className={cx("px-2 py-1 text-right tabular-nums", row.faulty && "text-fault")}>
                {row.dropped}
                {row.droppedDetail ? (
                  <span className="block text-[0.85em] text-ink-soft">{row.droppedDetail}</span>
                ) : null}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
