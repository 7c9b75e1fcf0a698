"use client";

import { useMemo } from "react";
import {
  CartesianGrid,
  Line,
  LineChart,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from "recharts";
import type { RunHistoryItem } from "./run-history-types";

/** Share of finished runs that passed, per day (UTC), oldest first. */
export function passRateByDay(runs: readonly RunHistoryItem[]) {
  const days = new Map<string, { pass: number; total: number }>();
  for (const run of runs) {
    if (run.status !== "finished" && run.status !== "errored") continue;
    const day = run.createdAt.slice(0, 10);
    const entry = days.get(day) ?? { pass: 0, total: 0 };
    entry.total += 1;
    if (run.verdict === "pass") entry.pass += 1;
    days.set(day, entry);
  }
  return [...days.entries()]
    .sort(([a], [b]) => a.localeCompare(b))
    .map(([day, { pass, total }]) => ({
      day,
      passRatePercent: Math.round((pass / total) * 1000) / 10,
      runs: total,
    }));
}

/** Pass rate over time for the runs currently shown (the table's filters apply). */
export function PassRateChart({ runs }: { runs: readonly RunHistoryItem[] }) {
  const data = useMemo(() => passRateByDay(runs), [runs]);
  if (data.length === 0) {
    return <p className="text-sm text-ink-soft">No finished runs to chart yet.</p>;
  }
  return (
    <figure aria-label="Pass rate over time" className="h-56 w-full">
      <ResponsiveContainer width="100%" height="100%">
        <LineChart data={data} margin={{ top: 8, right: 16, bottom: 8, left: 0 }}>
          <CartesianGrid stroke="#dcd0ba" strokeDasharray="3 3" />
          <XAxis dataKey="day" tick={{ fontSize: 11 }} />
          <YAxis domain={[0, 100]} unit=" %" tick={{ fontSize: 11 }} width={48} />
          <Tooltip
            formatter={(value, name) =>
              name === "passRatePercent"
                ? [`${String(value)} %`, "pass rate"]
                : [String(value), String(name)]
            }
          />
          <Line
            type="monotone"
            dataKey="passRatePercent"
            stroke="#166b61" // --color-teal
            strokeWidth={2}
            dot={{ r: 3 }}
            isAnimationActive={false}
          />
        </LineChart>
      </ResponsiveContainer>
      <figcaption className="sr-only">Share of finished runs that passed, per day</figcaption>
    </figure>
  );
}
