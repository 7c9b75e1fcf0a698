import dgram from "node:dgram";
import {
  initialTunnellingServerState,
  KNXNETIP_PORT,
  nextDeadlineUs,
  tunnellingServerConfig,
  tunnellingServerTransition,
  type LineAccess,
  type TunnelConnection,
  type TunnellingServerConfig,
  type TunnellingServerCounters,
  type TunnellingServerEffect,
  type TunnellingServerEvent,
  type TunnellingServerState,
  type UdpAddress,
} from "@/engine";
import { systemClock, type WallClock } from "./real-time-pacer";

/**
 * A KNXnet/IP tunnelling endpoint on UDP: binds the pure tunnelling server
 * (engine/knxnetip/tunnelling-server.ts) to a socket and to a simulated line
 * through `LineAccess`.
 *
 * Bound to 127.0.0.1 unless `host` names another address (KNXnet/IP has no
 * authentication: whoever can reach the port can write to the bench). Answers
 * go to the IP address a datagram came from, whatever a client's HPAI says.
 * The port is the first free one of `ports` (3671, the standard port, first);
 * `{ first: 0, last: 0 }` takes an ephemeral port (tests).
 */
export interface KnxNetIpEndpointOptions {
  readonly line: LineAccess;
  /** Individual addresses on the bench's line for the tunnels, one each. */
  readonly tunnelAddresses: readonly number[];
  /** The endpoint's own individual address (device information). */
  readonly individualAddress: number;
  readonly host?: string;
  readonly ports?: { readonly first: number; readonly last: number };
  /** Overrides of the server's timeouts, limits and identity. */
  readonly server?: Partial<
    Omit<TunnellingServerConfig, "endpoint" | "tunnelAddresses" | "individualAddress" | "canReach">
  >;
  readonly clock?: WallClock;
  /** Every effect but datagrams and line puts: tunnels opened and closed, datagrams dropped. */
  readonly onEvent?: (
    effect: Exclude<TunnellingServerEffect, { kind: "send" } | { kind: "line.put" }>,
  ) => void;
}

export interface KnxNetIpEndpoint {
  /** Where the endpoint answers. */
  readonly address: UdpAddress;
  /** The open tunnels. */
  connections(): readonly TunnelConnection[];
  counters(): TunnellingServerCounters;
  /** Closes one tunnel from the server side (DISCONNECT_REQUEST to its client). */
  disconnect(channelId: number): void;
  /** Closes every tunnel the way `close` does, but keeps answering (the simulation behind it restarted). */
  disconnectAll(): void;
  /** Ends every tunnel with a DISCONNECT_REQUEST, then closes the socket. */
  close(): Promise<void>;
}

export const DEFAULT_HOST = "127.0.0.1";
export const DEFAULT_PORTS = { first: KNXNETIP_PORT, last: KNXNETIP_PORT + 9 };

export async function startKnxNetIpEndpoint(
  options: KnxNetIpEndpointOptions,
): Promise<KnxNetIpEndpoint> {
  const host = options.host ?? DEFAULT_HOST;
  const clock = options.clock ?? systemClock;
  const socket = await bindFirstFree(host, options.ports ?? DEFAULT_PORTS);
  const bound = socket.address();
  const config = tunnellingServerConfig({
    ...options.server,
    endpoint: { address: host, port: bound.port },
    tunnelAddresses: options.tunnelAddresses,
    individualAddress: options.individualAddress,
  });
  let state: TunnellingServerState = initialTunnellingServerState();
  let timer: unknown;
  let closed = false;
  let sendsInFlight = 0;
  let drained: (() => void) | undefined;
  const queue: TunnellingServerEvent[] = [];
  let draining = false;
  const nowUs = () => Math.floor(clock.nowMs() * 1000);

  function dispatch(event: TunnellingServerEvent): void {
    queue.push(event);
    if (draining) return; // a line callback inside an effect: handled after the current event
    draining = true;
    try {
      while (queue.length > 0) {
        const result = tunnellingServerTransition(config, state, queue.shift()!);
        state = result.state;
        for (const effect of result.effects) apply(effect);
      }
    } finally {
      draining = false;
    }
    reschedule();
  }

  function apply(effect: TunnellingServerEffect): void {
    switch (effect.kind) {
      case "send":
        sendsInFlight++;
        socket.send(effect.bytes, effect.to.port, effect.to.address, () => {
          sendsInFlight--;
          if (sendsInFlight === 0) drained?.();
        });
        return;
      case "line.put":
        options.line.put(effect.frame, (acknowledged) =>
          dispatch({
            kind: "line.confirmed",
            nowUs: nowUs(),
            requestId: effect.requestId,
            acknowledged,
          }),
        );
        return;
      default:
        options.onEvent?.(effect);
    }
  }

  function reschedule(): void {
    if (timer !== undefined) clock.clearTimeout(timer);
    timer = undefined;
    if (closed) return;
    const deadline = nextDeadlineUs(config, state);
    if (deadline === undefined) return;
    timer = clock.setTimeout(
      () => {
        timer = undefined;
        dispatch({ kind: "tick", nowUs: nowUs() });
      },
      Math.max(0, Math.ceil((deadline - nowUs()) / 1000)),
    );
  }

  socket.on("message", (bytes, remote) => {
    if (closed || remote.family !== "IPv4") return;
    dispatch({
      kind: "datagram",
      nowUs: nowUs(),
      from: { address: remote.address, port: remote.port },
      bytes: new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength),
    });
  });
  // A send to a vanished client must not take the endpoint down.
  socket.on("error", () => undefined);
  const unsubscribe = options.line.subscribe((frame) => {
    if (!closed) dispatch({ kind: "line.frame", nowUs: nowUs(), frame });
  });

  return {
    address: { address: host, port: bound.port },
    connections: () => [...state.connections.values()],
    counters: () => state.counters,
    disconnect(channelId) {
      if (!closed) dispatch({ kind: "disconnect", nowUs: nowUs(), channelId });
    },
    disconnectAll() {
      if (!closed) dispatch({ kind: "shutdown", nowUs: nowUs() });
    },
    async close() {
      if (closed) return;
      dispatch({ kind: "shutdown", nowUs: nowUs() });
      closed = true;
      reschedule();
      unsubscribe();
      if (sendsInFlight > 0) await new Promise<void>((resolve) => (drained = resolve));
      await new Promise<void>((resolve) => socket.close(() => resolve()));
    },
  };
}

async function bindFirstFree(
  host: string,
  ports: { readonly first: number; readonly last: number },
): Promise<dgram.Socket> {
  let lastError: unknown;
  for (let port = ports.first; port <= ports.last; port++) {
    const socket = dgram.createSocket("udp4");
    try {
      await new Promise<void>((resolve, reject) => {
        socket.once("error", reject);
        socket.bind(port, host, () => {
          socket.off("error", reject);
          resolve();
        });
      });
      return socket;
    } catch (error) {
      lastError = error;
      try {
        socket.close();
      } catch {
        // never bound: nothing to close
      }
    }
  }
  throw new Error(
    `no free UDP port for KNXnet/IP on ${host} in ${ports.first}..${ports.last}: ${String(lastError)}`,
  );
}
