import type { SimCommand } from "./sim-protocol";

/**
 * Where the simulation runs, as the console sees it: something that takes
 * commands and feeds the store (`SimStore.apply`) with the live session's
 * messages. Two transports implement it: the browser's Web Worker
 * (sim-client.ts) and a session hosted by the server (server-sim-client.ts,
 * event stream in, HTTP commands out). The store and the views never ask which.
 */
export interface SimTransport {
  /** Sends a command; a refusal comes back into the store as a command-error naming the field. */
  send(command: SimCommand): void;
  /** Stops listening; the worker is ended, a server session keeps running for others. */
  dispose(): void;
}
