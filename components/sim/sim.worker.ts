import { LiveSession } from "@/engine";
import type { SimMessage } from "./sim-protocol";

/**
 * The live console's simulation worker: the engine runs here so the page stays
 * responsive however busy the bus is. All logic is in the engine's live
 * session; this file only wires it to the worker's messages, the worker's wall
 * clock and a 25 ms tick.
 */

/**
 * Batches go out this often, ms of wall time. With the session's 15 ms tick budget the worker is
 * free to take a command at least every 25 ms, and an input is answered at once (the session
 * flushes after it), so a press waits for neither a long tick nor the next one.
 */
const TICK_MS = 25;

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
