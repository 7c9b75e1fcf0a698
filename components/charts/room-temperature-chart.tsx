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
/** One dash pattern per unit's setpoint line, so units in one room tell apart without new colours. */
const SETPOINT_DASHES = ["4 2", "1 3", "8 3 2 3", "12 4"];

/** What a sample says each unit works toward: one entry for a unit's own room, one per unit in a bench room. */
function unitsOf(sample: RoomSample) {
  return "roomId" in sample
    ? sample.units
    : [{ unitId: sample.unitId, setpointC: sample.setpointC, power: sample.power }];
}

/**
 * Room temperature against setpoint over virtual time (minutes): for a bench
 * room, its air temperature from the shared room model with one setpoint line
 * per unit in it; for a unit in no room, the unit's own room and setpoint.
 */
export function RoomTemperatureChart({
  name,
  samples,
  unitNames,
}: {
  name: string;
  samples: readonly RoomSample[];
  /** Device name by id, for the setpoint lines. */
  unitNames: ReadonlyMap<string, string>;
}) {
  const latest = samples.at(-1);
  const isRoom = latest !== undefined && "roomId" in latest;
  // Units named in any kept sample, in the order they first appear (a unit may join a room by a parameter change).
  const unitIds = useMemo(() => {
    const ids = new Set<string>();
    for (const sample of samples) for (const unit of unitsOf(sample)) ids.add(unit.unitId);
    return [...ids];
  }, [samples]);
  const data = useMemo(
    () =>
      thinSamples(samples, MAX_POINTS).map((s) => {
        const point: Record<string, number> = {
          minute: s.timeUs / 60_000_000,
          roomC: Math.round(s.roomC * 100) / 100,
        };
        for (const unit of unitsOf(s)) point[`setpoint:${unit.unitId}`] = unit.setpointC;
        return point;
      }),
    [samples],
  );
  const latestUnits = latest === undefined ? [] : unitsOf(latest);
  const single = !isRoom ? latestUnits[0] : undefined;
  return (
    <figure
      aria-label={
        isRoom
          ? `Room temperature and setpoints in ${name}`
          : `Room temperature and setpoint of ${name}`
      }
      data-setpoint={single?.setpointC}
      data-room={latest?.roomC}
    >
      <figcaption className="mb-1 text-xs text-ink-soft">
        {name}: room {latest ? `${latest.roomC.toFixed(2)} °C` : "–"}
        {isRoom ? (
          latestUnits.length === 0 ? (
            ", no unit in this room"
          ) : (
            <ul className="inline">
              {latestUnits.map((unit) => (
                <li
                  key={unit.unitId}
                  className="ml-2 inline"
                  data-unit={unit.unitId}
                  data-setpoint={unit.setpointC}
                >
                  {unitNames.get(unit.unitId) ?? unit.unitId} {unit.setpointC.toFixed(1)} °C
                  {unit.power ? "" : " (off)"}
                </li>
              ))}
            </ul>
          )
        ) : (
          <>, setpoint {single ? `${single.setpointC.toFixed(1)} °C` : "–"}</>
        )}
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
          {unitIds.map((unitId, i) => (
            <Line
              key={unitId}
              type="stepAfter"
              dataKey={`setpoint:${unitId}`}
              name={isRoom ? `Setpoint ${unitNames.get(unitId) ?? unitId}` : "Setpoint"}
              stroke={TEAL}
              dot={false}
              strokeDasharray={SETPOINT_DASHES[i % SETPOINT_DASHES.length]}
              isAnimationActive={false}
            />
          ))}
        </LineChart>
      </ResponsiveContainer>
    </figure>
  );
}
