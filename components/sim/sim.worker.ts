import { SimHost } from "./sim-host";
import type { SimMessage } from "./sim-protocol";

/**
 * The live console's simulation worker: the engine runs here so the page stays
 * responsive however busy the bus is. All logic is in SimHost; this file only
 * wires it to the worker's messages and a 50 ms wall-clock tick.
 */

/** Batches go out this often, ms of wall time. */
const TICK_MS = 50;

const scope = globalThis as unknown as {
  postMessage(message: SimMessage): void;
  onmessage: ((event: MessageEvent<unknown>) => void) | null;
};

const host = new SimHost({
  post: (message) => scope.postMessage(message),
  now: () => performance.now(),
});
scope.onmessage = (event) => host.handle(event.data);
setInterval(() => host.tick(), TICK_MS);
