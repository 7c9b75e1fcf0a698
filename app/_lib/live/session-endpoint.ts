import {
  formatIndividualAddress,
  tunnelAddressPool,
  type LineAccess,
  type LoadedBench,
  type TunnellingServerConfig,
} from "@/engine";
import type { KnxNetIpSettings } from "../config";
import { AppError } from "../errors";
import { startKnxNetIpEndpoint, type KnxNetIpEndpoint } from "../knxnet/udp-endpoint";
import type { LiveSessionClock } from "./live-session-clock";
import type { EndpointView } from "./live-session-view";

/** Timeouts and limits of the tunnelling server a test may shorten (heartbeat). */
export type ServerOverrides = Partial<
  Omit<TunnellingServerConfig, "endpoint" | "tunnelAddresses" | "individualAddress" | "canReach">
>;

/**
 * A live session's KNXnet/IP endpoint: the UDP endpoint on the session's line,
 * with individual addresses from the bench line's free ones, and what the
 * console shows of it (address, port, clients with their counters).
 */
export class SessionEndpoint {
  private constructor(
    private readonly endpoint: KnxNetIpEndpoint,
    private readonly loopback: boolean,
    private readonly individualAddress: number,
    /** The tunnels' individual addresses: telegrams from them are marked in the log. */
    readonly tunnelAddresses: readonly number[],
    /** Wall-clock ms each open tunnel connected at, by channel id. */
    private readonly connectedAt: ReadonlyMap<number, number>,
  ) {}

  /**
   * Binds an endpoint for `bench`'s test-tool line; 409 when the line has too
   * few free addresses or no port of the range is free.
   */
  static async open(options: {
    readonly line: LineAccess;
    readonly bench: LoadedBench;
    readonly settings: KnxNetIpSettings;
    readonly server: ServerOverrides;
    readonly clock: LiveSessionClock;
    /** A client connected or went. */
    readonly onClientsChanged: () => void;
  }): Promise<SessionEndpoint> {
    const { bench, settings, clock } = options;
    const pool = tunnelAddressPool(bench, bench.testToolLine, settings.tunnels);
    if (!pool.ok) throw new AppError("conflict", pool.error.message);
    const connectedAt = new Map<number, number>();
    let endpoint: KnxNetIpEndpoint;
    try {
      endpoint = await startKnxNetIpEndpoint({
        line: options.line,
        tunnelAddresses: pool.value.tunnelAddresses,
        individualAddress: pool.value.individualAddress,
        host: settings.host,
        ports: settings.ports,
        server: options.server,
        clock,
        onEvent: (effect) => {
          if (effect.kind === "tunnel.opened")
            connectedAt.set(effect.connection.channelId, clock.epochMs());
          else if (effect.kind === "tunnel.closed") connectedAt.delete(effect.connection.channelId);
          else return;
          options.onClientsChanged();
        },
      });
    } catch (error) {
      throw new AppError("conflict", (error as Error).message);
    }
    return new SessionEndpoint(
      endpoint,
      settings.loopback,
      pool.value.individualAddress,
      pool.value.tunnelAddresses,
      connectedAt,
    );
  }

  /** Open tunnels. */
  get clientCount(): number {
    return this.endpoint.connections().length;
  }

  /** False when no tunnel has that channel. */
  disconnect(channelId: number): boolean {
    if (!this.endpoint.connections().some((c) => c.channelId === channelId)) return false;
    this.endpoint.disconnect(channelId);
    return true;
  }

  /** Ends every tunnel (DISCONNECT_REQUEST) and keeps answering: the simulation behind it restarted. */
  disconnectAll(): void {
    this.endpoint.disconnectAll();
  }

  /** Ends every tunnel with a DISCONNECT_REQUEST (sent before the first await), then closes the socket. */
  close(): Promise<void> {
    return this.endpoint.close();
  }

  view(fallbackConnectedAtMs: number): EndpointView {
    const { address, port } = this.endpoint.address;
    return {
      address,
      port,
      loopback: this.loopback,
      individualAddress: formatIndividualAddress(this.individualAddress),
      clients: this.endpoint.connections().map((c) => ({
        channelId: c.channelId,
        address: c.client.address,
        port: c.client.port,
        individualAddress: formatIndividualAddress(c.individualAddress),
        connectedSince: new Date(
          this.connectedAt.get(c.channelId) ?? fallbackConnectedAtMs,
        ).toISOString(),
        telegramsIn: c.telegramsIn,
        telegramsOut: c.telegramsOut,
      })),
    };
  }
}
