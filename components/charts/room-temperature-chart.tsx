"use client";

import {
  CartesianGrid,
  Legend,
  Line,
  LineChart,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from "recharts";
import { useMemo } from "react";
import type { RoomSample } from "@/components/sim/sim-protocol";
import { thinSamples } from "./thin-samples";

/** Points drawn per line: more than a chart of this width can show apart. */
const MAX_POINTS = 240;

const COPPER = "#b3662c";
const TEAL = "#1e8377";

/** Room temperature against setpoint for one indoor unit over virtual time (minutes). */
export function RoomTemperatureChart({
  name,
  samples,
}: {
  name: string;
  samples: readonly RoomSample[];
}) {
  const data = useMemo(
    () =>
      thinSamples(samples, MAX_POINTS).map((s) => ({
        minute: s.timeUs / 60_000_000,
        roomC: Math.round(s.roomC * 100) / 100,
        setpointC: s.setpointC,
      })),
    [samples],
  );
  const latest = samples.at(-1);
  return (
    <figure
      aria-label={`Room temperature and setpoint of ${name}`}
      data-setpoint={latest?.setpointC}
      data-room={latest?.roomC}
    >
      <figcaption className="mb-1 text-xs text-ink-soft">
        {name}: room {latest ? `${latest.roomC.toFixed(2)} °C` : "–"}, setpoint{" "}
        {latest ? `${latest.setpointC.toFixed(1)} °C` : "–"}
      </figcaption>
      <ResponsiveContainer width="100%" height={180}>
        <LineChart data={data} margin={{ top: 4, right: 8, bottom: 4, left: 0 }}>
          <CartesianGrid stroke="#dcd0ba" strokeDasharray="3 3" />
          <XAxis
            dataKey="minute"
            type="number"
            domain={["dataMin", "dataMax"]}
            tickFormatter={(m: number) => `${m.toFixed(1)}`}
            unit=" min"
            fontSize={11}
          />
          <YAxis domain={["auto", "auto"]} unit=" °C" fontSize={11} width={56} />
          <Tooltip
            formatter={(value) => `${Number(value).toFixed(2)} °C`}
            labelFormatter={(m) => `${Number(m).toFixed(2)} min`}
          />
          <Legend wrapperStyle={{ fontSize: 11 }} />
          <Line
            type="monotone"
            dataKey="roomC"
            name="Room"
            stroke={COPPER}
            dot={false}
            isAnimationActive={false}
          />
          <Line
            type="stepAfter"
            dataKey="setpointC"
            name="Setpoint"
            stroke={TEAL}
            dot={false}
            strokeDasharray="4 2"
            isAnimationActive={false}
          />
        </LineChart>
      </ResponsiveContainer>
    </figure>
  );
}
