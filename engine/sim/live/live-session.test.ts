import { describe, expect, it } from "vitest";
import { trainingRoomBench } from "../../../test/harness/training-room-bench";
import { LiveSession } from "./live-session";
import type { SimMessage } from "./live-protocol";

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
    expect(new Set(rooms.map((r) => r.unitId))).toEqual(new Set(["unit"]));
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
});
