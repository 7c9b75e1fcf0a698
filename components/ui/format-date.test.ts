import { describe, expect, it } from "vitest";
import { formatDate, formatDateTime, formatRelative } from "./format-date";

// The order is ISO 8601's calendar date and time of day, year first (from memory:
// ISO 8601-1, extended format YYYY-MM-DD and hh:mm); the rest is our own wording.
describe("the one date format", () => {
  it("writes the date year first, in UTC, and says UTC", () => {
    // 2 December 2026 is the case the issue named: day-first and month-first readers disagree on 02/12.
    expect(formatDateTime(new Date("2026-12-02T14:05:59Z"))).toBe("2026-12-02 14:05 UTC");
    expect(formatDateTime("2026-12-02T02:42:27.000Z")).toBe("2026-12-02 02:42 UTC");
    expect(formatDateTime(Date.UTC(2027, 0, 3, 9, 7))).toBe("2027-01-03 09:07 UTC");
    expect(formatDate("2030-06-30T00:00:00.000Z")).toBe("2030-06-30");
  });

  it("keeps text that is not a date as it is rather than printing Invalid Date", () => {
    expect(formatDateTime("soon")).toBe("soon");
    expect(formatDate("soon")).toBe("soon");
  });

  it("says how recent a time is in whole units, past and future", () => {
    const now = new Date("2026-12-02T12:00:00Z");
    const at = (ms: number) => new Date(now.getTime() + ms);
    expect(formatRelative(at(-10_000), now)).toBe("just now");
    expect(formatRelative(at(-3 * 60_000), now)).toBe("3 min ago");
    expect(formatRelative(at(-59 * 60_000 - 59_000), now)).toBe("59 min ago");
    expect(formatRelative(at(-5 * 3_600_000), now)).toBe("5 h ago");
    expect(formatRelative(at(-86_400_000), now)).toBe("1 day ago");
    expect(formatRelative(at(7 * 86_400_000), now)).toBe("in 7 days");
    expect(formatRelative(at(80 * 60_000), now)).toBe("in 1 h");
    expect(formatRelative(at(23 * 3_600_000 + 40 * 60_000), now)).toBe("in 1 day");
    // A lab due a week after seeding still reads as a week a few minutes later.
    expect(formatRelative(at(7 * 86_400_000 - 5 * 60_000), now)).toBe("in 7 days");
    expect(formatRelative(at(-40 * 86_400_000), now)).toBeNull();
    expect(formatRelative("soon", now)).toBeNull();
  });
});
