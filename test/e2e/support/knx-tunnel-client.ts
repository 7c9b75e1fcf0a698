import { disconnectClient, releaseClient, unconnectedClient } from "../../harness/knx-client";

/**
 * The `knx` npm package (test-only devDependency, "Libraries" in
 * knx-reference.md) as a real KNXnet/IP tunnelling client, for browser tests
 * that check what the console shows of a connected client. 127.0.0.1 only;
 * every wait is bounded and `close` releases the socket and the timers.
 * Built on the harness's client (test/harness/knx-client.ts); this one also
 * notices when the server ends the tunnel and then stays disconnected.
 */

export interface TunnelClient {
  /** Sends a GroupValue_Write through the tunnel, e.g. ("1/0/1", 1, "DPT1.001"). */
  write(groupAddress: string, value: unknown, dpt: string): void;
  /**
   * Resolves when the server ends the tunnel (a DISCONNECT_REQUEST), within `timeoutMs`.
   * The package would dial again at once; this client stays disconnected instead.
   */
  disconnectedByServer(timeoutMs: number): Promise<void>;
  /** Disconnects (if still connected) and releases the socket and timers. */
  close(): Promise<void>;
}

/** Connects a tunnelling client to 127.0.0.1:`port`, within `timeoutMs`. */
export function connectTunnelClient(port: number, timeoutMs: number): Promise<TunnelClient> {
  const connection = unconnectedClient(port);
  let serverEnded = false;
  const ended = new Set<() => void>();
  const onDisconnected = () => {
    if (serverEnded || connection.state === "uninitialized") return;
    // Emitted on entering "connecting", just before the package sends its next
    // CONNECT_REQUEST: turn sending off so it does not come back as a new tunnel.
    serverEnded = true;
    connection.send = () => undefined;
    for (const resolve of ended) resolve();
  };

  const close = async () => {
    if (!serverEnded && connection.state !== "uninitialized" && connection.state !== "connecting")
      await disconnectClient(connection);
    connection.off("disconnected", onDisconnected);
    releaseClient(connection);
  };

  const client: TunnelClient = {
    write: (groupAddress, value, dpt) => connection.write(groupAddress, value, dpt),
    disconnectedByServer: (waitMs) =>
      serverEnded
        ? Promise.resolve()
        : new Promise<void>((resolve, reject) => {
            const timer = setTimeout(() => {
              ended.delete(done);
              reject(new Error(`the server did not end the tunnel within ${waitMs} ms`));
            }, waitMs);
            const done = () => {
              clearTimeout(timer);
              resolve();
            };
            ended.add(done);
          }),
    close,
  };

  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => {
      connection.off("connected", onConnected);
      void close().then(() =>
        reject(new Error(`no tunnel to 127.0.0.1:${port} within ${timeoutMs} ms`)),
      );
    }, timeoutMs);
    const onConnected = () => {
      clearTimeout(timer);
      connection.off("connected", onConnected);
      // Only now: the package also emits "disconnected" while it first dials.
      connection.on("disconnected", onDisconnected);
      resolve(client);
    };
    connection.on("connected", onConnected);
    connection.Connect();
  });
}
