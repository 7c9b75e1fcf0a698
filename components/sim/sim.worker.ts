import { LiveSession } from "@/engine";
import type { SimMessage } from "./sim-protocol";

/**
 * The live console's simulation worker: the engine runs here so the page stays
 * responsive however busy the bus is. All logic is in the engine's live
 * session; this file only wires it to the worker's messages, the worker's wall
 * clock and a 50 ms tick.
 */

/**
 * Batches go out this often, ms of wall time. An input does not wait for it: the session
 * answers an input with a batch at once, and its 15 ms tick budget bounds how long a command
 * waits behind a running tick.
 */
const TICK_MS = 50;

const scope = globalThis as unknown as {
  postMessage(message: SimMessage): void;
  onmessage: ((event: MessageEvent<unknown>) => void) | null;
};

const host = new LiveSession({
  post: (message) => scope.postMessage(message),
  now: () => performance.now(),
});
scope.onmessage = (event) => host.handle(event.data);
setInterval(() => host.tick(), TICK_MS);
