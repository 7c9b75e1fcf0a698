import { checkSimMessage, type SimCommand } from "./sim-protocol";
import type { SimStore } from "./sim-store";
import type { SimTransport } from "./sim-transport";

/** The part of a Worker the client uses, so tests can hand in a fake. */
export interface SimPort {
  postMessage(message: unknown): void;
  onmessage: ((event: MessageEvent<unknown>) => void) | null;
  terminate(): void;
}

/**
 * The page side of the worker (the browser transport): posts typed commands and folds every message
 * into the store. Commands are validated once, by the worker, which treats
 * whatever arrives as untrusted and answers a bad one with a command-error
 * naming the field (the store shows it like any other refusal); the page
 * builds its commands from typed code, so checking them here too only cost
 * time. Messages get the cheap envelope check (see `checkSimMessage`).
 */
export class SimClient implements SimTransport {
  constructor(
    private readonly port: SimPort,
    private readonly store: SimStore,
  ) {
    port.onmessage = (event) => store.getState().apply(checkSimMessage(event.data));
  }

  /** Sends a command; the worker answers a malformed one with a command-error naming the field. */
  send(command: SimCommand): void {
    this.port.postMessage(command);
  }

  dispose(): void {
    this.port.onmessage = null;
    this.port.terminate();
  }
}

/** Starts the simulation worker (bundled by Next from this module's URL). */
export function startSimWorker(): SimPort {
  return new Worker(new URL("./sim.worker.ts", import.meta.url), {
    type: "module",
    name: "benchline-sim",
  });
}
