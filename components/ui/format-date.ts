/**
 * The one way Benchline shows a date: ISO 8601 order, year first ("2026-12-02
 * 14:05 UTC"), which no reader can take for day-first or month-first, in UTC
 * and saying so, so a server-rendered page, the browser and an e-mail all show
 * the same text. Where recency matters a relative part ("3 min ago", "in 7
 * days") goes beside it, never instead of it.
 */
export type DateInput = Date | string | number;

function toDate(value: DateInput): Date | null {
  const date = value instanceof Date ? value : new Date(value);
  return Number.isNaN(date.getTime()) ? null : date;
}

/** "2026-12-02 14:05 UTC"; text that is not a date comes back unchanged. */
export function formatDateTime(value: DateInput): string {
  const date = toDate(value);
  if (!date) return String(value);
  return `${date.toISOString().slice(0, 16).replace("T", " ")} UTC`;
}

/** "2026-12-02" (the UTC day), for due dates and expiry days. */
export function formatDate(value: DateInput): string {
  const date = toDate(value);
  if (!date) return String(value);
  return date.toISOString().slice(0, 10);
}

const MINUTE_MS = 60_000;
const HOUR_MS = 60 * MINUTE_MS;
const DAY_MS = 24 * HOUR_MS;

/**
 * How long ago (or how soon) `value` is from `now`: "just now", "3 min ago",
 * "5 h ago", "2 days ago", "in 7 days". Null from 30 days on, where the date
 * itself says more. Minutes round down ("59 min ago" never reads as an hour);
 * hours and days round to the nearest, so a lab due a week after it was set
 * still reads "in 7 days" a few minutes later.
 */
export function formatRelative(value: DateInput, now: DateInput): string | null {
  const date = toDate(value);
  const reference = toDate(now);
  if (!date || !reference) return null;
  const deltaMs = date.getTime() - reference.getTime();
  const distance = Math.abs(deltaMs);
  if (distance < 45_000) return "just now";
  const minutes = Math.floor(distance / MINUTE_MS);
  const hours = Math.round(distance / HOUR_MS);
  const days = Math.round(distance / DAY_MS);
  let amount: string;
  if (minutes < 60) amount = `${Math.max(1, minutes)} min`;
  else if (hours < 24) amount = `${hours} h`;
  else if (days < 30) amount = `${days} ${days === 1 ? "day" : "days"}`;
  else return null;
  return deltaMs < 0 ? `${amount} ago` : `in ${amount}`;
}
