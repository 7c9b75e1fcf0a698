"use client";

import { useEffect, useMemo, useRef, useState } from "react";
import { useSimState, useSimStore } from "@/components/sim/sim-context";
import type { LogRow } from "@/components/sim/sim-protocol";
import { Button } from "@/components/ui/button";
import { cx } from "@/components/ui/cx";
import { formatVirtualTime } from "./format-time";
import {
  emptyLogFilter,
  FilteredLog,
  isEmptyFilter,
  logRowsToCsv,
  type LogFilter,
} from "./log-filter";

/** Fixed row height: the windowing below depends on it. */
export const LOG_ROW_HEIGHT_PX = 24;
const VIEWPORT_HEIGHT_PX = 384;
const OVERSCAN_ROWS = 8;
const COLUMNS =
  "grid grid-cols-[6.5rem_4.5rem_13rem_8.5rem_minmax(6rem,1fr)_3.5rem_1.5rem_2.5rem_12rem] gap-x-2";

const SERVICE_LABEL: Record<string, string> = {
  GroupValue_Write: "Write",
  GroupValue_Read: "Read",
  GroupValue_Response: "Response",
};

/**
 * The telegram log: every telegram (and fault) with its time, addresses,
 * service, decoded value, priority, repeat flag, acknowledgement and raw
 * frame. Rows have a fixed height and only the visible window is rendered,
 * so 100,000 rows scroll as smoothly as 100; it re-renders once per batch.
 */
export function TelegramLog() {
  const store = useSimStore();
  const version = useSimState((s) => s.logVersion);
  const bench = useSimState((s) => s.bench);
  const dropped = useSimState((s) => s.droppedRows);
  const [filter, setFilter] = useState<LogFilter>(emptyLogFilter);
  const [follow, setFollow] = useState(true);
  const [scrollTop, setScrollTop] = useState(0);
  const viewport = useRef<HTMLDivElement>(null);

  const log = store.getState().log;
  const filtered = useMemo(
    () => (isEmptyFilter(filter) ? null : new FilteredLog(filter)),
    [filter],
  );
  // Re-rendered when `version` moves (the ring gained rows); `update` only scans the new rows.
  const count = filtered === null ? log.length : filtered.update(log);

  useEffect(() => {
    if (follow && viewport.current) viewport.current.scrollTop = count * LOG_ROW_HEIGHT_PX;
  }, [follow, count, version]);

  const first = Math.max(0, Math.floor(scrollTop / LOG_ROW_HEIGHT_PX) - OVERSCAN_ROWS);
  const last = Math.min(
    count,
    Math.ceil((scrollTop + VIEWPORT_HEIGHT_PX) / LOG_ROW_HEIGHT_PX) + OVERSCAN_ROWS,
  );
  const rowAt = (i: number): LogRow => log.at(filtered === null ? i : filtered.ringIndex(i, log));
  const visible: { index: number; row: LogRow }[] = [];
  for (let i = first; i < last; i++) visible.push({ index: i, row: rowAt(i) });

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
        </select>
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
        <span className="ml-auto text-xs text-ink-soft" aria-live="off">
          <span data-testid="log-count">{count}</span> rows{filtered ? " match" : ""}
          {dropped > 0 ? ` · ${dropped} dropped while the page caught up` : ""}
        </span>
      </div>
      <div className="overflow-x-auto rounded-md border border-paper-line bg-white">
        <div className="min-w-[62rem]">
          <div
            className={cx(
              COLUMNS,
              "border-b border-paper-line bg-paper-deep px-2 py-1 text-xs font-medium text-ink-soft",
            )}
            role="row"
          >
            <span>Time</span>
            <span>Source</span>
            <span>Destination</span>
            <span>Service</span>
            <span>Value</span>
            <span>Priority</span>
            <span title="Repeat flag">R</span>
            <span>Ack</span>
            <span>Raw</span>
          </div>
          <div
            ref={viewport}
            role="log"
            aria-label="Telegram log"
            className="relative overflow-y-auto"
            style={{ height: VIEWPORT_HEIGHT_PX }}
            onScroll={(e) => {
              const target = e.currentTarget;
              setScrollTop(target.scrollTop);
              // Scrolling up away from the newest row pauses following, as a reader expects.
              if (
                follow &&
                target.scrollTop + target.clientHeight < target.scrollHeight - 2 * LOG_ROW_HEIGHT_PX
              )
                setFollow(false);
            }}
          >
            <div style={{ height: count * LOG_ROW_HEIGHT_PX }}>
              {visible.map(({ index, row }) => (
                <LogRowView key={row.seq} row={row} top={index * LOG_ROW_HEIGHT_PX} />
              ))}
            </div>
          </div>
        </div>
      </div>
    </div>
  );
}

function LogRowView({ row, top }: { row: LogRow; top: number }) {
  const fault = row.kind === "fault";
  return (
    <div
      role="row"
      data-kind={row.kind}
      className={cx(
        COLUMNS,
        "absolute inset-x-0 items-center px-2 font-mono text-xs whitespace-nowrap",
        fault ? "bg-fault-soft text-fault" : "text-ink",
      )}
      style={{ top, height: LOG_ROW_HEIGHT_PX }}
    >
      <span className="tabular-nums">{formatVirtualTime(row.timeUs)}</span>
      <span className="truncate">{row.source}</span>
      <span className="truncate">
        <span className="text-copper-deep">{row.destination}</span>{" "}
        <span className="font-sans">{row.destinationName}</span>
      </span>
      <span className="truncate font-sans">
        {fault ? row.service : (SERVICE_LABEL[row.service] ?? row.service)}
      </span>
      <span className="truncate" title={row.value}>
        {row.value}
      </span>
      <span className="font-sans">{row.priority}</span>
      <span>{row.kind === "telegram" ? (row.repeated ? "R" : "·") : ""}</span>
      <span className={row.ack === "ack" ? "text-teal" : row.ack === "" ? "" : "text-fault"}>
        {row.ack}
      </span>
      <span className="truncate text-ink-soft" title={row.rawHex}>
        {row.rawHex}
      </span>
    </div>
  );
}
