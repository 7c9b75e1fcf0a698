import { parseSimCommand, parseSimMessage, type SimCommand } from "./sim-protocol";
import type { SimStore } from "./sim-store";

/** The part of a Worker the client uses, so tests can hand in a fake. */
export interface SimPort {
  postMessage(message: unknown): void;
  onmessage: ((event: MessageEvent<unknown>) => void) | null;
  terminate(): void;
}

/**
 * The page side of the worker: validates commands before they leave and
 * messages when they arrive, and folds every message into the store.
 */
export class SimClient {
  constructor(
    private readonly port: SimPort,
    private readonly store: SimStore,
  ) {
    port.onmessage = (event) => store.getState().apply(parseSimMessage(event.data));
  }

  /** Sends a command; a malformed one is refused here with the field named in the store's error. */
  send(command: SimCommand): void {
    const parsed = parseSimCommand(command);
    if (!parsed.ok) {
      this.store.getState().apply({
        type: "command-error",
        command: command.type,
        field: parsed.field,
        message: parsed.message,
      });
      return;
    }
    this.port.postMessage(parsed.value);
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
