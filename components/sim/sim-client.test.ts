import { describe, expect, it } from "vitest";
import { LiveSession } from "@/engine";
import { trainingRoomBench } from "@/test/harness/training-room-bench";
import { SimClient, type SimPort } from "./sim-client";
import { checkSimMessage, type SimCommand } from "./sim-protocol";
import { createSimStore } from "./sim-store";

/** A client whose "worker" is a live session in this process, through structured clone both ways. */
function wired() {
  const store = createSimStore();
  const port: SimPort = {
    onmessage: null,
    postMessage: (command) => session.handle(structuredClone(command)),
    terminate: () => {},
  };
  const session = new LiveSession({
    post: (message) =>
      port.onmessage?.({ data: structuredClone(message) } as MessageEvent<unknown>),
    now: () => 0,
  });
  const client = new SimClient(port, store);
  return { store, client };
}

describe("SimClient", () => {
  it("leaves command validation to the worker, which names the bad field in the store's error", () => {
    const { store, client } = wired();
    client.send({ type: "load", bench: trainingRoomBench });
    expect(store.getState().status).toBe("ready");
    client.send({ type: "jump", durationUs: -5 } as SimCommand);
    expect(store.getState().lastError).toMatchObject({ command: "jump", field: "durationUs" });
  });
});

describe("checkSimMessage", () => {
  it("passes a message of a protocol type through as it is", () => {
    const message = { type: "reset-done", clock: { nowUs: 0, running: false, speed: 1 } };
    expect(checkSimMessage(message)).toBe(message);
  });

  it("throws on a message that is not one of the protocol's", () => {
    expect(() => checkSimMessage({ type: "teleport" })).toThrow(/unknown type "teleport"/);
    expect(() => checkSimMessage(null)).toThrow(/unknown type/);
  });
});
