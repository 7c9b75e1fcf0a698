"use client";

import { useVirtualizer } from "@tanstack/react-virtual";
import { memo, useLayoutEffect, useMemo, useRef, useState } from "react";
import { useSimState, useSimStore } from "@/components/sim/sim-context";
import type { BenchSummary, LogRow } from "@/components/sim/sim-protocol";
import { Button } from "@/components/ui/button";
import { cx } from "@/components/ui/cx";
import { formatVirtualTime } from "./format-time";
import { FAULTY_DROP_REASONS } from "./coupler-totals";
import {
  emptyLogFilter,
  FilteredLog,
  isEmptyFilter,
  logRowsToCsv,
  type LogFilter,
} from "./log-filter";
import { ShownValue } from "./shown-value";
import { useFrameSimState } from "./use-frame-sim-state";

/** Fixed row height: the virtualizer's estimate is exact, so no row is measured. */
export const LOG_ROW_HEIGHT_PX = 24;
const DEFAULT_VIEWPORT_HEIGHT_PX = 384;
const OVERSCAN_ROWS = 8;
const LOG_REFRESH_MS = 100;
/**
 * Every column fits a 1,110 px log (1440 px window with the navigation open)
 * without scrolling sideways, frames of up to 11 octets whole; names and
 * longer frames are cut with "…" (whole on hover), down to about 960 px (a
 * 1024 px tablet with the navigation folded).
 */
const COLUMNS =
  "grid grid-cols-[6rem_3.5rem_minmax(8rem,1fr)_minmax(9rem,1.2fr)_5rem_minmax(6rem,1fr)_3.5rem_3rem_2.5rem_minmax(8rem,15rem)] gap-x-2";
const HEADERS = [
  "Time",
  "Line",
  "Source",
  "Destination",
  "Service",
  "Value",
  "Priority",
  "Repeat",
  "Ack",
  "Raw",
] as const;

const SERVICE_LABEL: Record<string, string> = {
  GroupValue_Write: "Write",
  GroupValue_Read: "Read",
  GroupValue_Response: "Response",
};

/**
 * The telegram log: every telegram (and fault) with its time, sender and
 * destination with their names, service, decoded value, priority, repeat
 * flag, acknowledgement and raw frame. Rows have a fixed height and only the
 * visible window is rendered (@tanstack/react-virtual), so 100,000 rows
 * scroll as smoothly as 100; new rows show at most ten times a second.
 */
export function TelegramLog({
  heightPx = DEFAULT_VIEWPORT_HEIGHT_PX,
}: {
  /** Height of the scrolling rows, px; the console's layout resizes it. */
  heightPx?: number;
}) {
  const store = useSimStore();
  // Ten redraws a second follow a busy bus as well as sixty, for a sixth of the page's work.
  const version = useFrameSimState((s) => s.logVersion, LOG_REFRESH_MS);
  const bench = useSimState((s) => s.bench);
  const dropped = useFrameSimState((s) => s.droppedRows);
  const [filter, setFilter] = useState<LogFilter>(emptyLogFilter);
  const [follow, setFollow] = useState(true);
  const viewport = useRef<HTMLDivElement>(null);
  const senders = useMemo(() => senderNames(bench), [bench]);

  const log = store.getState().log;
  const filtered = useMemo(
    () => (isEmptyFilter(filter) ? null : new FilteredLog(filter)),
    [filter],
  );
  // Re-rendered when `version` moves (the ring gained rows); `update` only scans the new rows.
  const count = filtered === null ? log.length : filtered.update(log);
  const rowAt = (i: number): LogRow => log.at(filtered === null ? i : filtered.ringIndex(i, log));

  // The virtualizer hands back fresh functions each render; this component is not compiler-memoised.
  // eslint-disable-next-line react-hooks/incompatible-library
  const virtualizer = useVirtualizer({
    count,
    getScrollElement: () => viewport.current,
    estimateSize: () => LOG_ROW_HEIGHT_PX,
    overscan: OVERSCAN_ROWS,
    getItemKey: (i) => rowAt(i).seq,
    // Before the first measurement (and in tests without layout) assume the set height.
    initialRect: { width: 0, height: heightPx },
  });

  // Following the newest row: jump to the end before the browser paints.
  useLayoutEffect(() => {
    if (follow && viewport.current) viewport.current.scrollTop = count * LOG_ROW_HEIGHT_PX;
  }, [follow, count, version, heightPx]);

  const exportCsv = () => {
    const rows: LogRow[] = [];
    for (let i = 0; i < count; i++) rows.push(rowAt(i));
    const url = URL.createObjectURL(
      new Blob([logRowsToCsv(rows)], { type: "text/csv;charset=utf-8" }),
    );
    const link = document.createElement("a");
    link.href = url;
    link.download = "telegram-log.csv";
    link.click();
    URL.revokeObjectURL(url);
  };

  const fieldClass = "rounded-md border border-paper-line bg-white px-2 py-1 text-sm";
  return (
    <div className="space-y-2">
      <div className="flex flex-wrap items-end gap-2" role="search" aria-label="Log filters">
        <input
          aria-label="Filter by address"
          placeholder="Address"
          className={cx(fieldClass, "w-28 font-mono")}
          value={filter.address}
          onChange={(e) => setFilter({ ...filter, address: e.target.value })}
        />
        <select
          aria-label="Filter by device"
          className={fieldClass}
          value={filter.deviceId}
          onChange={(e) => setFilter({ ...filter, deviceId: e.target.value })}
        >
          <option value="">All devices</option>
          {bench?.devices.map((d) => (
            <option key={d.id} value={d.id}>
              {d.name}
            </option>
          ))}
        </select>
        <select
          aria-label="Filter by service"
          className={fieldClass}
          value={filter.service}
          onChange={(e) => setFilter({ ...filter, service: e.target.value })}
        >
          <option value="">All services</option>
          <option value="GroupValue_Write">Write</option>
          <option value="GroupValue_Read">Read</option>
          <option value="GroupValue_Response">Response</option>
          <option value="fault">Faults</option>
          <option value="coupler">Coupler actions</option>
        </select>
        {bench !== null && bench.lines.length > 1 ? (
          <select
            aria-label="Filter by line"
            className={fieldClass}
            value={filter.line}
            onChange={(e) => setFilter({ ...filter, line: e.target.value })}
          >
            <option value="">All lines</option>
            {bench.lines.map((line) => (
              <option key={line.id} value={line.address}>
                {line.address} {line.name}
              </option>
            ))}
          </select>
        ) : null}
        <input
          aria-label="Filter by text"
          placeholder="Text"
          className={cx(fieldClass, "w-40")}
          value={filter.text}
          onChange={(e) => setFilter({ ...filter, text: e.target.value })}
        />
        <Button variant="secondary" aria-pressed={!follow} onClick={() => setFollow(!follow)}>
          {follow ? "Pause auto-scroll" : "Resume auto-scroll"}
        </Button>
        <Button variant="secondary" onClick={exportCsv} disabled={count === 0}>
          Export CSV
        </Button>
        <span className="ml-auto text-xs text-ink-soft">
          <span data-testid="log-count">{count}</span> rows{filtered ? " match" : ""}
          {dropped > 0 ? ` · ${dropped} dropped while the page caught up` : ""}
        </span>
      </div>
      <div
        role="table"
        aria-label="Telegram log"
        aria-rowcount={count + 1}
        className="overflow-x-auto rounded-md border border-paper-line bg-white"
      >
        <div role="rowgroup">
          <div
            role="row"
            aria-rowindex={1}
            className={cx(
              COLUMNS,
              "border-b border-paper-line bg-paper-deep px-2 py-1 text-xs font-medium text-ink-soft",
            )}
          >
            {HEADERS.map((header) => (
              <span key={header} role="columnheader" className="truncate">
                {header}
              </span>
            ))}
          </div>
        </div>
        {/* Focusable so the rows scroll from the keyboard (arrows, Page Up/Down, Home/End). */}
        <div
          ref={viewport}
          role="rowgroup"
          tabIndex={0}
          className="relative overflow-y-auto focus-visible:outline-offset-[-2px]"
          style={{ height: heightPx }}
          onScroll={(e) => {
            const target = e.currentTarget;
            // Scrolling up away from the newest row pauses following, as a reader expects.
            if (
              follow &&
              target.scrollTop + target.clientHeight < target.scrollHeight - 2 * LOG_ROW_HEIGHT_PX
            )
              setFollow(false);
          }}
        >
          <div style={{ height: virtualizer.getTotalSize() }}>
            {virtualizer.getVirtualItems().map((item) => {
              const row = rowAt(item.index);
              return (
                <LogRowView
                  key={item.key}
                  row={row}
                  index={item.index}
                  top={item.start}
                  sender={senderOf(row, senders)}
                  coupler={row.coupler ? (senders.get(row.coupler.id) ?? row.coupler.id) : ""}
                />
              );
            })}
          </div>
        </div>
      </div>
    </div>
  );
}

/**
 * Device id -> name (the test tool sends with no device id), and individual
 * address -> name: a coupler's copy of a telegram keeps its original sender's
 * address, so that is the name shown beside it.
 */
function senderNames(bench: BenchSummary | null): Map<string, string> {
  const names = new Map<string, string>([["", "test tool"]]);
  for (const device of bench?.devices ?? []) {
    names.set(device.id, device.name);
    if (device.individualAddress !== null) names.set(`@${device.individualAddress}`, device.name);
  }
  if (bench) names.set(`@${bench.testToolAddress}`, "test tool");
  return names;
}

function senderOf(row: LogRow, senders: ReadonlyMap<string, string>): string {
  if (row.coupler?.action === "forward")
    return senders.get(`@${row.source}`) ?? senders.get(row.deviceId) ?? "";
  return senders.get(row.deviceId) ?? "";
}

/** One row; rows are immutable in the ring, so a row already on screen never re-renders. */
const LogRowView = memo(function LogRowView({
  row,
  index,
  top,
  sender,
  coupler,
}: {
  row: LogRow;
  index: number;
  top: number;
  sender: string;
  /** The coupler's name when one forwarded, held or dropped the telegram; "" otherwise. */
  coupler: string;
}) {
  const couplerRow = row.kind === "coupler";
  const fault =
    row.kind === "fault" ||
    (couplerRow &&
      row.coupler?.reason !== undefined &&
      FAULTY_DROP_REASONS.has(row.coupler.reason));
  const service =
    row.kind === "fault"
      ? row.service
      : couplerRow
        ? row.coupler?.action === "hold"
          ? "Held"
          : "Dropped"
        : (SERVICE_LABEL[row.service] ?? row.service);
  const lineNote =
    row.coupler === undefined
      ? ""
      : row.coupler.action === "forward"
        ? `passed onto line ${row.line} by ${coupler}`
        : row.coupler.action === "hold"
          ? `held by ${coupler} for line ${row.coupler.toLine}`
          : `dropped by ${coupler} for line ${row.coupler.toLine}${row.coupler.reason ? `: ${row.coupler.reason}` : ""}`;
  const source =
    row.kind === "fault" || couplerRow
      ? row.source
      : `${row.source} ${row.tunnel ? "over KNXnet/IP" : sender}`;
  const destination = `${row.destination} ${row.destinationName}`;
  return (
    <div
      role="row"
      aria-rowindex={index + 2}
      data-kind={row.kind}
      data-tunnel={row.tunnel || undefined}
      data-coupler={row.coupler?.action}
      className={cx(
        COLUMNS,
        "absolute inset-x-0 items-center px-2 font-mono text-xs whitespace-nowrap",
        fault ? "bg-fault-soft text-fault" : couplerRow ? "bg-paper-deep text-ink" : "text-ink",
      )}
      style={{ top, height: LOG_ROW_HEIGHT_PX }}
    >
      <span role="cell" className="tabular-nums">
        {formatVirtualTime(row.timeUs)}
      </span>
      <span role="cell" className="truncate" title={lineNote || undefined}>
        {row.line}
        {row.coupler ? (
          <>
            {" "}
            <span aria-hidden="true" className="text-copper-deep">
              {row.coupler.action === "forward" ? "⇅" : row.coupler.action === "hold" ? "⏸" : "⊘"}
            </span>
            <span className="sr-only">{lineNote}</span>
          </>
        ) : null}
      </span>
      <span role="cell" className="truncate" title={source}>
        {row.kind === "fault" || couplerRow ? (
          <span className="font-sans">{row.source}</span>
        ) : (
          <>
            {row.source}{" "}
            {row.tunnel ? (
              <TunnelMark tunnel={row.tunnel} />
            ) : (
              <span className="font-sans">{sender}</span>
            )}
          </>
        )}
      </span>
      <span role="cell" className="truncate" title={destination}>
        <span className={fault ? undefined : "text-copper-deep"}>{row.destination}</span>{" "}
        <span className="font-sans">{row.destinationName}</span>
      </span>
      <span role="cell" className="truncate font-sans">
        {/* A fault row says so in words and with a mark, not by its colour alone. */}
        {row.kind === "fault" ? (
          <span aria-hidden="true">{row.service.endsWith("cleared") ? "✓ " : "⚠ "}</span>
        ) : null}
        {service}
      </span>
      <span role="cell" className="truncate" title={row.value}>
        <ShownValue value={row.value} />
      </span>
      <span role="cell" className="font-sans">
        {row.priority}
      </span>
      <span role="cell" className="font-sans">
        {row.kind === "telegram" ? (row.repeated ? "yes" : "no") : ""}
      </span>
      <span role="cell" className={row.ack === "ack" ? "text-teal" : undefined}>
        {row.ack}
      </span>
      <span role="cell" className="truncate text-ink-soft" title={row.rawHex}>
        {row.rawHex}
      </span>
    </div>
  );
});

/** A telegram that came in from a KNXnet/IP tunnel client rather than a bench device. */
function TunnelMark({ tunnel }: { tunnel: string }) {
  return (
    <abbr
      title={`Came in over KNXnet/IP, tunnel ${tunnel}`}
      className="rounded bg-copper/10 px-1 font-sans text-[0.85em] font-semibold text-copper-deep no-underline"
    >
      IP
    </abbr>
  );
}
