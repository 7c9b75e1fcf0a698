import { describe, expect, it } from "vitest";
import { filterTrace, toHex, Trace, type TraceEvent } from "./trace";

const note = (timeUs: number, deviceId = "pb-1"): TraceEvent => ({
  kind: "device.note",
  timeUs,
  deviceId,
  text: `t${timeUs}`,
});
const sent = (timeUs: number, destination: number): TraceEvent => ({
  kind: "telegram.sent",
  timeUs,
  endUs: timeUs + 10,
  telegramId: 1,
  line: "main",
  source: 0x1101,
  destination,
  service: "GroupValue_Write",
  priority: "low",
  payloadHex: "01",
  shortPayload: true,
  attempt: 0,
  repeated: false,
  octets: 9,
  arbitrationLosers: 0,
  deviceId: "pb-1",
});

describe("Trace", () => {
  it("keeps every event in order by default", () => {
    const trace = new Trace();
    [1, 2, 3].forEach((t) => trace.append(note(t)));
    expect(trace.events().map((e) => e.timeUs)).toEqual([1, 2, 3]);
  });

  it("keeps only the most recent events in ring mode, oldest first", () => {
    const trace = new Trace({ capacity: 3 });
    [1, 2, 3, 4, 5].forEach((t) => trace.append(note(t)));
    expect(trace.events().map((e) => e.timeUs)).toEqual([3, 4, 5]);
    expect(trace.appended).toBe(5);
  });

  it("is inactive with capacity 0 until someone subscribes", () => {
    const trace = new Trace({ capacity: 0 });
    expect(trace.active).toBe(false);
    const seen: TraceEvent[] = [];
    const unsubscribe = trace.subscribe((e) => seen.push(e));
    expect(trace.active).toBe(true);
    trace.append(note(1));
    unsubscribe();
    expect(trace.active).toBe(false);
    expect(seen).toHaveLength(1);
    expect(trace.events()).toHaveLength(0);
  });

  it("slices by time with an inclusive start and exclusive end", () => {
    const trace = new Trace();
    [0, 10, 10, 20, 30].forEach((t) => trace.append(note(t)));
    expect(trace.slice(10, 30).map((e) => e.timeUs)).toEqual([10, 10, 20]);
  });

  it("filters by address, device and kind prefix", () => {
    const events = [sent(0, 0x0801), note(5), sent(10, 0x0802), note(15, "act-1")];
    expect(filterTrace(events, { address: 0x0802 })).toEqual([events[2]]);
    expect(filterTrace(events, { deviceId: "act-1" })).toEqual([events[3]]);
    expect(filterTrace(events, { kinds: ["telegram."] })).toHaveLength(2);
    expect(filterTrace(events, { kinds: ["device.note"], fromUs: 6 })).toEqual([events[3]]);
  });

  it("writes payloads as upper-case hex", () => {
    expect(toHex(new Uint8Array([0x0c, 0x1a, 0xff]))).toBe("0C1AFF");
  });
});
