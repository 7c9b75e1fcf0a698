"use client";

import {
  Bar,
  BarChart,
  CartesianGrid,
  ReferenceLine,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from "recharts";
import { useMemo } from "react";
import type { BusLoadSample } from "@/components/sim/sim-protocol";

/** Bars drawn: one per virtual second; older seconds still count for the peak. */
const SECONDS_SHOWN = 120;

/**
 * Bus load per virtual second on one line, with the line's maximum (100 %,
 * about 50 short telegrams a second: knx-reference.md, TP1 timing, derived)
 * and the highest second so far marked.
 */
export function BusLoadChart({
  line,
  label,
  samples,
}: {
  /** The line's id, as the samples name it. */
  line: string;
  /** The line as people say it: "1.1 Lab room line". */
  label: string;
  samples: readonly BusLoadSample[];
}) {
  const { data, peak } = useMemo(() => {
    const own = samples.filter((s) => s.line === line);
    return {
      // The peak is over every kept second; the bars show the latest ones a chart can draw.
      peak: own.reduce((max, s) => Math.max(max, Math.round(s.loadPercent * 10) / 10), 0),
      data: own.slice(-SECONDS_SHOWN).map((s) => ({
        second: s.second,
        load: Math.round(s.loadPercent * 10) / 10,
        telegrams: s.telegrams,
      })),
    };
  }, [samples, line]);
  return (
    <figure aria-label={`Bus load of line ${label}`} data-peak={peak}>
      <figcaption className="mb-1 text-xs text-ink-soft">
        Line {label}: peak {peak.toFixed(1)} % of the line maximum in one second (last{" "}
        {SECONDS_SHOWN} s shown)
      </figcaption>
      <ResponsiveContainer width="100%" height={160}>
        <BarChart data={data} margin={{ top: 12, right: 8, bottom: 4, left: 0 }}>
          <CartesianGrid stroke="#dcd0ba" strokeDasharray="3 3" vertical={false} />
          <XAxis dataKey="second" fontSize={11} unit=" s" />
          <YAxis domain={[0, 100]} unit=" %" fontSize={11} width={48} />
          <Tooltip
            formatter={(value, key) => (key === "load" ? `${value} %` : value)}
            labelFormatter={(s) => `second ${s}`}
          />
          <ReferenceLine
            y={100}
            stroke="#c42e28"
            strokeDasharray="4 2"
            label={{
              value: "line maximum",
              position: "insideTopRight",
              fontSize: 10,
              fill: "#c42e28",
            }}
          />
          {peak > 0 ? (
            <ReferenceLine
              y={peak}
              stroke="#8a4b1c"
              strokeDasharray="2 2"
              label={{
                value: `peak ${peak.toFixed(1)} %`,
                position: "insideTopLeft",
                fontSize: 10,
                fill: "#8a4b1c",
              }}
            />
          ) : null}
          <Bar dataKey="load" name="load" fill="#b3662c" isAnimationActive={false} />
        </BarChart>
      </ResponsiveContainer>
    </figure>
  );
}
