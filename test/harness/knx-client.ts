/*
 * The `knx` npm package (test-only devDependency, "Libraries" in knx-reference.md)
 * as a real KNXnet/IP tunnelling client over 127.0.0.1, for tests of our
 * endpoint. Every wait is bounded; `closeAll` ends every client a test made.
 */
import dgram from "node:dgram";
import { createRequire } from "node:module";
import { getDpt } from "@/engine";

/** The client's machina state machine: `on` / `off`, no `once`. */
export interface Emitter {
  on(event: string, listener: (...args: never[]) => void): unknown;
  off(event: string, listener: (...args: never[]) => void): void;
}

export interface KnxClient extends Emitter {
  state: string;
  write(ga: string, value: unknown, dpt: string): void;
  read(ga: string, callback: (src: string, value: Buffer) => void): void;
  transition(state: string): void;
  Connect(): void;
  Disconnect(callback?: () => void): void;
  send(datagram: unknown): void;
  idletimer?: ReturnType<typeof setTimeout> | null;
  connecttimer?: ReturnType<typeof setInterval>;
  socket?: dgram.Socket;
}

export const KNX_WAIT_MS = 4000;

let Connection: ((options: Record<string, unknown>) => KnxClient) | undefined;

/** The package's Connection, its logger silenced (log-driver) so the test output stays readable. */
function connection(): (options: Record<string, unknown>) => KnxClient {
  if (Connection !== undefined) return Connection;
  const require = createRequire(import.meta.url);
  const logger = createRequire(require.resolve("knx/package.json"))("log-driver").logger as Record<
    string,
    unknown
  >;
  for (const level of ["error", "warn", "info", "debug", "trace"]) logger[level] = () => undefined;
  Connection = (require("knx") as { Connection: typeof Connection }).Connection!;
  return Connection;
}

/** A tunnelling client for 127.0.0.1:port, not yet connected (call `Connect()`). */
export function unconnectedClient(port: number): KnxClient {
  return connection()({
    ipAddr: "127.0.0.1",
    ipPort: port,
    loglevel: "error",
    manualConnect: true,
  });
}

/** A set of clients a test opens; `closeAll` in afterEach. */
export function knxClients() {
  const open = new Set<KnxClient>();
  return {
    /** Connects a tunnelling client to 127.0.0.1:port, within KNX_WAIT_MS. */
    connect(port: number): Promise<KnxClient> {
      return new Promise((resolve, reject) => {
        const timeout = setTimeout(
          () => reject(new Error("knx client did not connect")),
          KNX_WAIT_MS,
        );
        const client = unconnectedClient(port);
        const onConnected = () => {
          clearTimeout(timeout);
          client.off("connected", onConnected);
          resolve(client);
        };
        client.on("connected", onConnected);
        open.add(client);
        client.Connect();
      });
    },
    async closeAll(): Promise<void> {
      for (const client of [...open]) await closeClient(client);
      open.clear();
    },
  };
}

export async function closeClient(client: KnxClient): Promise<void> {
  if (client.state !== "uninitialized") await disconnectClient(client);
  releaseClient(client);
}

/** Ends the tunnel with a DISCONNECT_REQUEST, waiting at most 1 s for the answer. */
export function disconnectClient(client: KnxClient): Promise<void> {
  return new Promise<void>((resolve) => {
    const timeout = setTimeout(resolve, 1000);
    client.Disconnect(() => {
      clearTimeout(timeout);
      resolve();
    });
  });
}

/** Stops the client's timers and closes its socket, so it neither dials again nor keeps the test alive. */
export function releaseClient(client: KnxClient): void {
  if (client.idletimer) clearTimeout(client.idletimer);
  if (client.connecttimer) clearInterval(client.connecttimer);
  client.transition("uninitialized");
  try {
    client.socket?.close();
  } catch {
    // already closed by the client
  }
}

/** The first emission of `event` whose arguments pass `accept`, within the timeout. */
export function waitFor(
  emitter: Emitter,
  event: string,
  accept: (...args: never[]) => boolean = () => true,
  timeoutMs = KNX_WAIT_MS,
) {
  return new Promise<unknown[]>((resolve, reject) => {
    const listener = (...args: never[]) => {
      if (!accept(...args)) return;
      clearTimeout(timeout);
      emitter.off(event, listener);
      resolve(args);
    };
    const timeout = setTimeout(() => {
      emitter.off(event, listener);
      reject(new Error(`no "${event}" within ${timeoutMs} ms`));
    }, timeoutMs);
    emitter.on(event, listener);
  });
}

/** A GroupValue_Read's response through the client, within the timeout. */
export function readResponse(client: KnxClient, groupAddress: string, timeoutMs = KNX_WAIT_MS) {
  return new Promise<[string, Buffer]>((resolve, reject) => {
    const timeout = setTimeout(() => reject(new Error("no response")), timeoutMs);
    client.read(groupAddress, (src, value) => {
      clearTimeout(timeout);
      resolve([src, value]);
    });
  });
}

/** Octets of a DPT 9.001 value, decoded by the engine's codec (DPT spec §3.10). */
export function dpt9(value: unknown): unknown {
  const decoded = getDpt("9.001")!.decode(new Uint8Array(value as Buffer));
  return decoded.ok ? decoded.value : decoded.error;
}

/** Drives the client's connection-state heartbeat now (its own period is a fixed 60 s). */
export async function heartbeat(client: KnxClient): Promise<void> {
  const answered = waitFor(
    client,
    "transition",
    (data: { toState: string }) => data.toState === "idle",
  );
  client.transition("requestingConnState");
  await answered;
}
