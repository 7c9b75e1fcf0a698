import { beforeAll, describe, expect, it } from "vitest";
import { benchBuilder, registerTestDevices } from "@/test/harness";
import { LiveSession } from "./live-session";
import { parseSimMessage, type LogRow, type SimMessage } from "./live-protocol";

beforeAll(registerTestDevices);

/** Sender on 1.1; listeners on 1.2; c12 holds a stale stored table without 1/0/1. */
const bench = () =>
  benchBuilder()
    .mainLine("l11", "1.1")
    .line("m1", "1.0")
    .line("l12", "1.2")
    .groupAddress("1/0/1", "7.001")
    .device("c11", "coupler", "1.1.0")
    .device("c12", "coupler", "1.2.0", { filterTable: [] })
    .device("s", "test-recorder", "1.1.1")
    .device("r", "test-recorder", "1.2.1")
    .device("m", "test-recorder", "1.0.1")
    .link("s", 0, "1/0/1")
    .link("r", 0, "1/0/1")
    .link("m", 0, "1/0/1")
    .build();

/** A live session with the bench loaded, keeping every message it posts (checked against the protocol). */
function loadedSession() {
  const messages: SimMessage[] = [];
  const session = new LiveSession({ post: (m) => messages.push(parseSimMessage(m)), now: () => 0 });
  session.handle({ type: "load", bench: bench() });
  return { messages, session };
}

/** s on line 1.1 sends once on 1/0/1, then two virtual seconds run. */
function sendFromLine11(session: LiveSession): void {
  session.handle({
    type: "input",
    input: { kind: "set-input", device: "s", input: "send", value: 4 },
  });
  session.handle({ type: "jump", durationUs: 2_000_000 });
  session.tick();
}

describe("live session on several lines", () => {
  it("log rows name their line and the coupler that forwarded or dropped; samples name the line address", () => {
    const { messages, session } = loadedSession();
    sendFromLine11(session);
    const batches = messages.filter(
      (m): m is Extract<SimMessage, { type: "batch" }> => m.type === "batch",
    );
    const rows: LogRow[] = batches.flatMap((b) => b.rows);
    const sent = rows.filter(
      (r) => r.kind === "telegram" && r.destination === "1/0/1" && !r.repeated,
    );
    expect(sent.map((r) => r.line)).toEqual(["1.1", "1.0"]);
    expect(sent[1]!.coupler).toEqual({ id: "c11", action: "forward", toLine: "1.0" });
    // The forwarded frame carries the decreased routing counter (octet 5, bits 6-4; knx-reference.md TP1 standard frame).
    expect(sent[1]!.rawHex.split(" ")[5]).toBe("D3");
    expect(rows.find((r) => r.kind === "coupler")).toMatchObject({
      line: "1.0",
      deviceId: "c12",
      coupler: { id: "c12", action: "drop", reason: "filter", toLine: "1.2" },
    });
    const samples = batches.flatMap((b) => b.busLoad);
    expect(new Set(samples.map((s) => s.lineAddress))).toEqual(new Set(["1.1", "1.0", "1.2"]));
  });

  it("counts a telegram once in the address rates, not again for each line a coupler forwards it to", () => {
    const { messages, session } = loadedSession();
    sendFromLine11(session);
    const batches = messages.filter(
      (m): m is Extract<SimMessage, { type: "batch" }> => m.type === "batch",
    );
    // s sent once on 1.1; c11's copy on 1.0 is the same telegram, so the rate shows it once.
    const total = batches
      .flatMap((b) => b.rates)
      .reduce((sum, sample) => sum + (sample.counts["1/0/1"] ?? 0), 0);
    expect(total).toBe(1);
  });
});

describe("address rates over several seconds", () => {
  it("count every telegram of a flood exactly once, frames across a second's end included", () => {
    const { messages, session } = loadedSession();
    // About 50 telegrams/s fit a TP1 line (knx-reference.md, TP1 timing), so 150 take about 3 s:
    // some frames are still on the line when a second ends.
    session.handle({ type: "flood", groupAddress: "1/0/1", count: 150, value: 1 });
    session.handle({ type: "jump", durationUs: 10_000_000 });
    session.tick();
    const samples = messages.flatMap((m) => (m.type === "batch" ? m.rates : []));
    expect(samples.length).toBeGreaterThan(2);
    expect(samples.reduce((sum, sample) => sum + (sample.counts["1/0/1"] ?? 0), 0)).toBe(150);
  });
});

describe("coupler totals in the live session", () => {
  it("counts what each coupler forwarded, held and dropped, and sends the totals when they change", () => {
    const { messages, session } = loadedSession();
    const first = messages.find((m) => m.type === "batch");
    // Every coupler is listed from the start, at zero, so the console can show them before any traffic.
    expect(first?.type === "batch" && first.couplers?.map((c) => [c.id, c.forwarded])).toEqual([
      ["c11", 0],
      ["c12", 0],
    ]);
    sendFromLine11(session);
    const latest = messages
      .flatMap((m) => (m.type === "batch" && m.couplers ? [m.couplers] : []))
      .at(-1)!;
    const byId = new Map(latest.map((c) => [c.id, c]));
    // c11 passes 1/0/1 up to the main line; c12's stale table (no 1/0/1) keeps it from r on 1.2.
    expect(byId.get("c11")).toMatchObject({ forwarded: 1, held: 0 });
    expect(byId.get("c12")).toMatchObject({ forwarded: 0, dropped: { filter: 1 } });
    // A late viewer gets the same totals.
    const late = session.currentState().find((m) => m.type === "batch");
    expect(late?.type === "batch" && late.couplers).toEqual(latest);
    // Nothing changed: the next batch leaves the totals out.
    session.handle({ type: "jump", durationUs: 1_000_000 });
    session.tick();
    const last = messages.at(-1)!;
    expect(last.type === "batch" && last.couplers).toBeUndefined();
  });
});
