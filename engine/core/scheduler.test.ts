import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { Scheduler } from "./scheduler";

function drain(s: Scheduler, limitUs = Infinity): [number, number, number][] {
  const out: [number, number, number][] = [];
  while (s.next(limitUs)) out.push([s.nowUs, s.firedTag, s.firedArg]);
  return out;
}

describe("Scheduler", () => {
  it("takes events in time order and advances the virtual clock to each", () => {
    const s = new Scheduler();
    s.schedule(300, 3);
    s.schedule(100, 1);
    s.schedule(200, 2);
    expect(drain(s)).toEqual([
      [100, 1, 0],
      [200, 2, 0],
      [300, 3, 0],
    ]);
    expect(s.nowUs).toBe(300);
  });

  it("keeps insertion order for events at the same microsecond", () => {
    const s = new Scheduler();
    for (let i = 0; i < 50; i++) s.schedule(1000, 7, i);
    expect(drain(s).map(([, , arg]) => arg)).toEqual([...Array(50).keys()]);
  });

  it("stops at the limit and leaves later events queued", () => {
    const s = new Scheduler();
    s.schedule(10, 1);
    s.schedule(20, 2);
    expect(drain(s, 15)).toEqual([[10, 1, 0]]);
    expect(s.peekTimeUs()).toBe(20);
    s.advanceTo(15);
    expect(s.nowUs).toBe(15);
  });

  it("refuses to schedule in the past or between microseconds (a caller bug)", () => {
    const s = new Scheduler();
    s.schedule(10, 1);
    s.next();
    expect(() => s.schedule(5, 1)).toThrow(/not an integer at or after now/);
    expect(() => s.schedule(10.5, 1)).toThrow(/not an integer/);
  });

  it("hands back payloads and grows past its initial capacity", () => {
    const s = new Scheduler(16);
    const payloads = Array.from({ length: 1000 }, (_, i) => ({ i }));
    payloads.forEach((p, i) => s.schedule(1000 - i, 0, i, p));
    let count = 0;
    let last = -1;
    while (s.next()) {
      expect(s.nowUs).toBeGreaterThanOrEqual(last);
      last = s.nowUs;
      expect(s.firedPayload).toBe(payloads[s.firedArg]);
      count++;
    }
    expect(count).toBe(1000);
  });

  it("orders any mix of schedules like a stable sort by time (property)", () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 50 }), { maxLength: 300 }), (times) => {
        const s = new Scheduler(16);
        times.forEach((t, i) => s.schedule(t, 0, i));
        const got = drain(s).map(([, , arg]) => arg);
        const expected = times
          .map((t, i) => [t, i] as const)
          .sort((a, b) => a[0] - b[0] || a[1] - b[1])
          .map(([, i]) => i);
        expect(got).toEqual(expected);
      }),
    );
  });

  it("interleaves scheduling while draining without losing order (property)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.integer({ min: 0, max: 20 }), fc.boolean()), { maxLength: 200 }),
        (ops) => {
          const s = new Scheduler(16);
          let last = 0;
          for (const [delay, take] of ops) {
            s.schedule(s.nowUs + delay, 0);
            if (take && s.next()) {
              expect(s.nowUs).toBeGreaterThanOrEqual(last);
              last = s.nowUs;
            }
          }
        },
      ),
    );
  });
});

describe("Scheduler handlers", () => {
  it("dispatches events to the handler registered for their tag, including ones scheduled meanwhile", () => {
    const s = new Scheduler();
    const seen: string[] = [];
    const ping = s.register((arg) => {
      seen.push(`ping ${arg}@${s.nowUs}`);
      if (arg < 3) s.schedule(s.nowUs + 10, pong, arg + 1);
    });
    const pong = s.register((arg) => {
      seen.push(`pong ${arg}@${s.nowUs}`);
      s.schedule(s.nowUs, ping, arg);
    });
    s.schedule(0, ping, 0);
    expect(s.run(25)).toBe(5);
    expect(seen).toEqual(["ping 0@0", "pong 1@10", "ping 1@10", "pong 2@20", "ping 2@20"]);
    expect(s.runOne()).toBe(true);
    expect(seen.at(-1)).toBe("pong 3@30");
  });
});
