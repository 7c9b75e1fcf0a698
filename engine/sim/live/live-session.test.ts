import { describe, expect, it } from "vitest";
import { trainingRoomBench } from "../../../test/harness/training-room-bench";
import { Tp1Sender } from "../../bus";
import { LiveSession } from "./live-session";
import { parseSimMessage, type LogRow, type SimMessage } from "./live-protocol";

/**
 * The live session runs in a plain Node process (this test's), with no Worker
 * and no DOM: wall time comes from an injected clock, messages go to a list.
 * The same class runs in the browser's worker (components/sim/sim.worker.ts).
 */
function nodeSession() {
  let wallMs = 0;
  const messages: SimMessage[] = [];
  const session = new LiveSession({ post: (m) => messages.push(m), now: () => wallMs });
  return {
    session,
    messages,
    batches: () => messages.filter((m) => m.type === "batch"),
    advanceWall(ms: number, tickMs = 50) {
      for (let t = 0; t < ms; t += tickMs) {
        wallMs += tickMs;
        session.tick();
      }
    },
  };
}

describe("LiveSession in a Node process", () => {
  it("paces virtual time by the injected wall clock at the chosen speed", () => {
    const node = nodeSession();
    node.session.handle({ type: "load", bench: trainingRoomBench });
    expect(node.messages[0]).toMatchObject({ type: "loaded", fresh: true });
    node.session.handle({ type: "play", speed: 10 });
    node.advanceWall(2_000);
    // 2 s of wall time at 10x is 20 s of virtual time.
    expect(node.session.nowUs).toBe(20_000_000);
  });

  it("logs a telegram with its acknowledgement and charts rooms through the device type's hook", () => {
    const node = nodeSession();
    node.session.handle({ type: "load", bench: trainingRoomBench });
    node.session.handle({ type: "play", speed: 1 });
    node.session.handle({
      type: "input",
      input: { kind: "write", groupAddress: "1/0/1", value: true },
    });
    node.advanceWall(2_000);
    const rows = node.batches().flatMap((b) => (b.type === "batch" ? b.rows : []));
    expect(rows.find((r) => r.destination === "1/0/1" && r.source === "1.1.250")).toMatchObject({
      service: "GroupValue_Write",
      ack: "ack",
    });
    const rooms = node.batches().flatMap((b) => (b.type === "batch" ? b.rooms : []));
    // Only the indoor unit offers a room sample; the session names no device type itself.
    expect(new Set(rooms.map((r) => ("unitId" in r ? r.unitId : r.roomId)))).toEqual(
      new Set(["unit"]),
    );
  });

  it("sends the bench it runs on load and again after a parameter change, so the page draws no second copy", () => {
    const node = nodeSession();
    node.session.handle({ type: "load", bench: trainingRoomBench });
    const first = node.messages[0];
    expect(first?.type === "loaded" && first.document.devices.map((d) => d.id)).toEqual(
      (trainingRoomBench.devices ?? []).map((d) => d.id),
    );
    node.session.handle({
      type: "input",
      input: { kind: "set-parameter", device: "gateway", parameter: "setpointMaxC", value: 26 },
    });
    const reloaded = node.messages.filter((m) => m.type === "loaded").at(-1);
    expect(reloaded).toMatchObject({ type: "loaded", fresh: false });
    const gateway =
      reloaded?.type === "loaded"
        ? reloaded.document.devices.find((d) => d.id === "gateway")
        : undefined;
    expect(gateway?.parameters).toMatchObject({ setpointMaxC: 26 });
  });

  it("answers an input at once at Max speed: the command and the status back, without waiting for a tick", () => {
    const node = nodeSession();
    node.session.handle({ type: "load", bench: trainingRoomBench });
    node.session.handle({ type: "play", speed: "max" });
    const before = node.messages.length;
    node.session.handle({
      type: "input",
      input: { kind: "write", groupAddress: "1/0/1", value: true },
    });
    const rows = node.messages.slice(before).flatMap((m) => (m.type === "batch" ? m.rows : []));
    // The light actuator switches on 1/0/1 and reports on 1/0/2 (training-room bench).
    expect(rows.map((r) => r.destination)).toEqual(expect.arrayContaining(["1/0/1", "1/0/2"]));
  });

  it("keeps the pace at a paced speed: an input sends what changed now and runs no virtual time", () => {
    const node = nodeSession();
    node.session.handle({ type: "load", bench: trainingRoomBench });
    node.session.handle({ type: "play", speed: 10 });
    const nowUs = node.session.nowUs;
    const before = node.messages.length;
    node.session.handle({ type: "press", deviceId: "rocker", buttonId: "channel-1" });
    expect(node.session.nowUs).toBe(nowUs);
    expect(node.messages.slice(before).map((m) => m.type)).toEqual(["batch"]);
  });

  it("hands a viewer who arrives late the whole state, and changes nothing doing so", () => {
    const node = nodeSession();
    node.session.handle({ type: "load", bench: trainingRoomBench });
    node.session.handle({ type: "play", speed: 1 });
    node.session.handle({ type: "press", deviceId: "rocker", buttonId: "channel-1" });
    node.session.handle({
      type: "input",
      input: { kind: "inject-fault", device: "light", fault: "bus.nak" },
    });
    node.advanceWall(2_000);
    const posted = node.batches().flatMap((b) => (b.type === "batch" ? b.rows : []));
    const before = node.messages.length;

    const snapshot = node.session.currentState().map(parseSimMessage);

    expect(node.messages).toHaveLength(before);
    expect(snapshot.map((m) => m.type)).toEqual(["loaded", "batch"]);
    expect(snapshot[0]).toMatchObject({ type: "loaded", fresh: true, clock: { speed: 1 } });
    const batch = snapshot[1]!;
    if (batch.type !== "batch") throw new Error("no batch");
    // Exactly the rows the others already have, so the late viewer's log starts where theirs is.
    expect(batch.rows).toEqual(posted);
    expect(posted.length).toBeGreaterThan(0);
    expect(batch.devices.map((d) => d.id)).toEqual(
      (trainingRoomBench.devices ?? []).map((d) => d.id),
    );
    expect(batch.faults).toContainEqual({ target: "light", fault: "bus.nak", by: "user" });
    expect(batch.rooms.map((r) => ("unitId" in r ? r.unitId : r.roomId))).toEqual(["unit"]);
    // Rows still waiting go to everyone with the next tick, the late viewer included.
    node.advanceWall(50);
    expect(node.messages.length).toBeGreaterThan(before);
  });

  it("keeps only the newest rows for a late viewer", () => {
    const messages: SimMessage[] = [];
    let wallMs = 0;
    const session = new LiveSession({
      post: (m) => messages.push(m),
      now: () => wallMs,
      recentRows: 3,
    });
    session.handle({ type: "load", bench: trainingRoomBench });
    session.handle({ type: "play", speed: 1 });
    session.handle({ type: "flood", groupAddress: "1/0/1", count: 8, value: true });
    for (let i = 0; i < 40; i++) {
      wallMs += 50;
      session.tick();
    }
    const posted = messages.flatMap((m) => (m.type === "batch" ? m.rows : []));
    const batch = session.currentState()[1];
    expect(batch?.type === "batch" && batch.rows).toEqual(posted.slice(-3));
  });

  it("marks a telegram sent from a KNXnet/IP tunnel's individual address in the log", () => {
    const node = nodeSession();
    node.session.handle({ type: "load", bench: trainingRoomBench });
    node.session.handle({ type: "play", speed: 1 });
    const tunnel = 0x11f1; // 1.1.241
    node.session.setTunnelSources([tunnel]);
    node.session.simulation!.line().queue(
      new Tp1Sender(tunnel, undefined, "tunnel 1.1.241"),
      {
        priority: "low",
        repeated: false,
        source: tunnel,
        destination: 0x0801, // 1/0/1
        addressType: "group",
        hopCount: 6,
        service: "GroupValue_Write",
        payload: Uint8Array.of(1),
        shortPayload: true,
      },
      -2,
    );
    node.session.handle({ type: "write", groupAddress: "1/0/1", value: false });
    node.advanceWall(1_000);
    const rows: LogRow[] = node.batches().flatMap((b) => (b.type === "batch" ? b.rows : []));
    const fromTunnel = rows.filter((r) => r.source === "1.1.241");
    expect(fromTunnel).toHaveLength(1);
    expect(fromTunnel[0]).toMatchObject({ tunnel: "1.1.241", destination: "1/0/1", ack: "ack" });
    // The test tool's and the devices' telegrams carry no mark.
    expect(rows.filter((r) => r.source !== "1.1.241").every((r) => r.tunnel === undefined)).toBe(
      true,
    );
  });
});
