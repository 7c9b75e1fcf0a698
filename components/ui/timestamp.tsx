"use client";

import { useSyncExternalStore } from "react";
import { type DateInput, formatDate, formatDateTime, formatRelative } from "./format-date";

// One shared clock for every relative time on the page, ticking twice a minute
// while something shows one; "3 min ago" stays true without a reload.
const TICK_MS = 30_000;
let nowMs = 0;
let timer: ReturnType<typeof setInterval> | undefined;
const listeners = new Set<() => void>();

function subscribe(listener: () => void) {
  listeners.add(listener);
  if (timer === undefined) {
    // The clock stood still while nothing showed a relative time; catch up at once.
    const fresh = Date.now();
    if (fresh !== nowMs) {
      nowMs = fresh;
      queueMicrotask(listener);
    }
    timer = setInterval(() => {
      nowMs = Date.now();
      for (const notify of listeners) notify();
    }, TICK_MS);
  }
  return () => {
    listeners.delete(listener);
    if (listeners.size === 0 && timer !== undefined) {
      clearInterval(timer);
      timer = undefined;
    }
  };
}

const clientNow = () => (nowMs === 0 ? (nowMs = Date.now()) : nowMs);
// The server and the hydrating render show no relative part, so their text agrees.
const serverNow = () => 0;

/**
 * A date in the one format (components/ui/format-date.ts) as a <time> element:
 * "2026-12-02 14:05 UTC", or the day alone with `dateOnly`. With `relative`, the
 * browser adds how long ago or how soon it is ("3 min ago", "in 7 days").
 */
export function Timestamp({
  value,
  dateOnly = false,
  relative = false,
  className,
}: {
  value: DateInput;
  dateOnly?: boolean;
  relative?: boolean;
  className?: string;
}) {
  const now = useSyncExternalStore(relative ? subscribe : noSubscription, clientNow, serverNow);
  const absolute = dateOnly ? formatDate(value) : formatDateTime(value);
  const ago = relative && now !== 0 ? formatRelative(value, now) : null;
  const date = new Date(value);
  const iso = Number.isNaN(date.getTime()) ? undefined : date.toISOString();
  return (
    <time dateTime={iso} className={className}>
      {absolute}
      {ago ? ` (${ago})` : null}
    </time>
  );
}

function noSubscription() {
  return () => {};
}
