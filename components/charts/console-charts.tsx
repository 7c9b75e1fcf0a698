"use client";

import { useMemo, useRef, useState } from "react";
import { useDeferredSimState } from "@/components/console/use-deferred-sim-state";
import { useOnScreen } from "@/components/console/use-on-screen";
import { roomSeriesKey } from "@/components/sim/chart-samples";
import { useSimState, useSimStore } from "@/components/sim/sim-context";
import { AddressRateChart } from "./address-rate-chart";
import { BusLoadChart } from "./bus-load-chart";
import { RoomTemperatureChart } from "./room-temperature-chart";

const CHART_REFRESH_MS = 1000;

/**
 * The console's charts, fed from the store: rooms (a bench room, or a unit in no room), bus load
 * per line, rates per address. Each chart works out its data only when its
 * samples changed, and draws a few hundred points at most.
 */
export function ConsoleCharts({
  lineLabels,
}: {
  /** "1.1 Lab room line" by line id. */
  lineLabels: ReadonlyMap<string, string>;
}) {
  const bench = useSimState((s) => s.bench);
  const document = useSimState((s) => s.benchDocument);
  // Charts are the heaviest thing on the page: redraw them once a second, not per batch,
  // and as interruptible transitions so a press is never stuck behind a redraw.
  // Charts scrolled out of view do not redraw at all.
  const box = useRef<HTMLDivElement>(null);
  const onScreen = useOnScreen(box);
  const store = useSimStore();
  const version = useDeferredSimState((s) => s.chartVersion, CHART_REFRESH_MS, onScreen);
  // The store appends samples to rings in place (same object, new version); they are copied out
  // here, once per redraw, so `version` is the dependency that says the rings changed.
  const { rooms, busLoad, rates } = useMemo(
    () => store.getState().charts.snapshot(),
    // eslint-disable-next-line react-hooks/exhaustive-deps -- the rings are mutated in place; version says when
    [store, version],
  );
  // A building has many lines: one chart at a time keeps the page short; "all" shows each.
  const [lineFilter, setLineFilter] = useState("");
  const names = useMemo(
    () => Object.fromEntries((bench?.groupAddresses ?? []).map((ga) => [ga.address, ga.name])),
    [bench],
  );
  const unitNames = useMemo(
    () => new Map((bench?.devices ?? []).map((d) => [d.id, d.name])),
    [bench],
  );
  if (bench === null) return null;
  // One chart per bench room, then one per unit in no room: which devices are units is known
  // from the samples the session sends (the device types' own hook), never from a type name.
  const series = [
    ...(document?.rooms ?? []).map((r) => ({ key: roomSeriesKey({ roomId: r.id }), name: r.name })),
    ...bench.devices.map((d) => ({ key: roomSeriesKey({ unitId: d.id }), name: d.name })),
  ].filter((s) => rooms[s.key] !== undefined);
  const shownLines =
    lineFilter === "" ? bench.lines : bench.lines.filter((line) => line.id === lineFilter);
  return (
    <div ref={box} className="space-y-4">
      {series.map((s) => (
        <RoomTemperatureChart
          key={s.key}
          name={s.name}
          samples={rooms[s.key]!}
          unitNames={unitNames}
        />
      ))}
      {bench.lines.length > 2 ? (
        <label className="flex items-center gap-2 text-xs text-ink-soft">
          Bus load on
          <select
            className="rounded-md border border-paper-line bg-white px-2 py-1 text-sm text-ink"
            value={lineFilter}
            onChange={(e) => setLineFilter(e.target.value)}
          >
            <option value="">every line ({bench.lines.length})</option>
            {bench.lines.map((line) => (
              <option key={line.id} value={line.id}>
                {lineLabels.get(line.id) ?? line.name}
              </option>
            ))}
          </select>
        </label>
      ) : null}
      {shownLines.map((line) => (
        <BusLoadChart
          key={line.id}
          line={line.id}
          label={lineLabels.get(line.id) ?? line.name}
          samples={busLoad}
        />
      ))}
      <AddressRateChart samples={rates} names={names} />
    </div>
  );
}
