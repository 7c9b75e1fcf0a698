import { decodeCemi, encodeCemi } from "../frame/cemi";
import type { DataFrame } from "../frame/data-frame";
import { CEMI_MESSAGE_CODES } from "../frame/cemi";
import { CONNECTION_TYPE, STATUS, TUNNEL_LAYER } from "./constants";
import { tunnelCrd } from "./connection-info";
import { isRouteBack, type Hpai } from "./hpai";
import { decodeKnxNetIpFrame, encodeKnxNetIpFrame, type FrameOf } from "./knxnetip-frame";
import { descriptionDibs, type TunnellingServerConfig, type UdpAddress } from "./server-config";

/**
 * A KNXnet/IP tunnelling server as a pure transition, like the devices:
 * `tunnellingServerTransition(config, state, event) -> { state, effects }`. The
 * caller owns the socket, the clock and the line; this decides what to answer.
 * Time is an injected `nowUs` on every event (wall-clock µs: outside software
 * lives in real time); nothing here reads a clock.
 *
 * KNXnet/IP spec (Core 03_08_02, Tunnelling 03_08_04; sections from memory):
 * - SEARCH / DESCRIPTION requests are answered with the device information and
 *   supported service families DIBs (core v1, tunnelling v1).
 * - CONNECT with a tunnel CRI on the link layer opens a tunnel with its own
 *   channel id and individual address from the configured pool; other
 *   connection types, options and layers, and a full table, are refused with
 *   E_CONNECTION_TYPE, E_CONNECTION_OPTION, E_TUNNELLING_LAYER and
 *   E_NO_MORE_CONNECTIONS; an HPAI over TCP with E_HOST_PROTOCOL_TYPE.
 * - CONNECTIONSTATE requests are the heartbeat: E_NO_ERROR for a live channel,
 *   E_CONNECTION_ID otherwise. A channel silent for `connectionAliveTimeoutUs`
 *   (120 s) is closed with a DISCONNECT_REQUEST to the client. Two more answers
 *   the Core spec gives a connection-state response (Core §7.8.4; from memory):
 *   E_KNX_CONNECTION (0x27) while the server's KNX side is down (the host says
 *   so with a `line.state` event), and E_DATA_CONNECTION (0x26) while the data
 *   connection to the client is failing: a tunnelling request to it went
 *   unacknowledged and is waiting on its one repetition.
 * - DISCONNECT from the client is answered and closes the tunnel; the server
 *   closes with a DISCONNECT_REQUEST (heartbeat lost, acknowledgement lost,
 *   operator, shutdown) and forgets the channel at once.
 * - Tunnelling requests carry a sequence counter per direction. From the
 *   client: the expected counter is acknowledged and executed; the previous
 *   one (a repetition) is acknowledged again and not executed; any other is
 *   dropped without acknowledgement. To the client: one request outstanding at
 *   a time; unacknowledged after `tunnellingRequestTimeoutUs` (1 s) it is sent
 *   once more, then the connection is closed.
 * - A cEMI L_Data.req becomes a `line.put` with the tunnel's individual address
 *   as source (from memory: interfaces fill in their own address); its
 *   `line.confirmed` becomes an L_Data.con, with the confirm bit set when the
 *   frame was not acknowledged on the line. Every frame on the line goes to
 *   each tunnel as L_Data.ind, except to the tunnel that sent it (that one gets
 *   the L_Data.con).
 * - An individually addressed L_Data.req to another tunnel's address goes to
 *   that tunnel as L_Data.ind (see `toOtherTunnel`); one to any other address
 *   is confirmed negatively, since the line model carries group frames only.
 *
 * Hostile input: a datagram that does not decode, a service a server does not
 * take, an unknown channel, or one sent from another IP address than the one
 * that connected is counted and dropped. Each client IP address has a token
 * bucket (`rateLimit`). An HPAI may name another port, but by default not
 * another IP address than the datagram's source (`canReach`): a forged request
 * cannot turn the server into a reflector aimed at a third party.
 */

/** One open tunnel. */
export interface TunnelConnection {
  readonly channelId: number;
  readonly individualAddress: number;
  /** Where the CONNECT_REQUEST came from; later requests for this channel must come from this IP address. */
  readonly client: UdpAddress;
  readonly controlEndpoint: UdpAddress;
  readonly dataEndpoint: UdpAddress;
  readonly connectedAtUs: number;
  readonly lastHeartbeatUs: number;
  /** Sequence counter expected in the client's next tunnelling request. */
  readonly receiveSequence: number;
  /** Sequence counter of the server's next tunnelling request. */
  readonly sendSequence: number;
  /** The request to the client waiting for its acknowledgement; `attempt` 1 or 2. */
  readonly outstanding:
    { readonly bytes: Uint8Array; readonly sentAtUs: number; readonly attempt: 1 | 2 } | undefined;
  /** cEMI messages waiting for the outstanding one to be acknowledged. */
  readonly queue: readonly Uint8Array[];
  /** Frames put on the line and not yet confirmed. */
  readonly pendingPuts: number;
  /** L_Data.req taken from the client. */
  readonly telegramsIn: number;
  /** L_Data.ind sent to the client. */
  readonly telegramsOut: number;
}

/** Counts of what the server dropped or refused, for the console and tests. */
export interface TunnellingServerCounters {
  readonly datagrams: number;
  readonly malformed: number;
  readonly rateLimited: number;
  readonly unsupported: number;
  readonly unknownChannel: number;
  readonly repeated: number;
  readonly outOfSequence: number;
  readonly queueOverflow: number;
  readonly putsRefused: number;
}

export interface TunnellingServerState {
  readonly connections: ReadonlyMap<number, TunnelConnection>;
  /** Where the search for a free channel id starts: ids rotate so a stale datagram rarely hits a new tunnel. */
  readonly nextChannelId: number;
  readonly nextRequestId: number;
  /** Frames on their way to the line, by request id. */
  readonly puts: ReadonlyMap<number, { readonly channelId: number; readonly frame: DataFrame }>;
  readonly buckets: ReadonlyMap<string, { readonly tokens: number; readonly atUs: number }>;
  readonly counters: TunnellingServerCounters;
  /** False while the KNX side (the simulated line) is unavailable; true from the start. */
  readonly lineAvailable: boolean;
}

export type CloseReason = "client" | "heartbeat" | "ack-timeout" | "operator" | "shutdown";

export type DropReason =
  | "malformed"
  | "rate-limited"
  | "unsupported"
  | "unknown-channel"
  | "out-of-sequence"
  | "queue-overflow";

export type TunnellingServerEvent =
  | {
      readonly kind: "datagram";
      readonly nowUs: number;
      readonly from: UdpAddress;
      readonly bytes: Uint8Array;
    }
  /** A frame was on the line (its first transmission). */
  | { readonly kind: "line.frame"; readonly nowUs: number; readonly frame: DataFrame }
  /** The line is done with a `line.put`: acknowledged, or given up after its repetitions. */
  | {
      readonly kind: "line.confirmed";
      readonly nowUs: number;
      readonly requestId: number;
      readonly acknowledged: boolean;
    }
  /** The KNX side went down or came back (E_KNX_CONNECTION; frames are then confirmed negatively). */
  | { readonly kind: "line.state"; readonly nowUs: number; readonly available: boolean }
  /** Time passed: heartbeat and acknowledgement timeouts. */
  | { readonly kind: "tick"; readonly nowUs: number }
  /** The operator closes a tunnel. */
  | { readonly kind: "disconnect"; readonly nowUs: number; readonly channelId: number }
  /** The endpoint stops: every tunnel is closed the way the spec says (DISCONNECT_REQUEST). */
  | { readonly kind: "shutdown"; readonly nowUs: number };

export type TunnellingServerEffect =
  | { readonly kind: "send"; readonly to: UdpAddress; readonly bytes: Uint8Array }
  | { readonly kind: "line.put"; readonly requestId: number; readonly frame: DataFrame }
  | { readonly kind: "tunnel.opened"; readonly connection: TunnelConnection }
  | {
      readonly kind: "tunnel.closed";
      readonly connection: TunnelConnection;
      readonly reason: CloseReason;
    }
  | {
      readonly kind: "dropped";
      readonly from: UdpAddress | undefined;
      readonly reason: DropReason;
      readonly detail: string;
    };

export interface TunnellingServerResult {
  readonly state: TunnellingServerState;
  readonly effects: readonly TunnellingServerEffect[];
}

const DROP_COUNTERS: Readonly<Record<DropReason, keyof TunnellingServerCounters>> = {
  malformed: "malformed",
  "rate-limited": "rateLimited",
  unsupported: "unsupported",
  "unknown-channel": "unknownChannel",
  "out-of-sequence": "outOfSequence",
  "queue-overflow": "queueOverflow",
};

const ZERO_COUNTERS: TunnellingServerCounters = {
  datagrams: 0,
  malformed: 0,
  rateLimited: 0,
  unsupported: 0,
  unknownChannel: 0,
  repeated: 0,
  outOfSequence: 0,
  queueOverflow: 0,
  putsRefused: 0,
};

/** A server with no tunnels. */
export function initialTunnellingServerState(): TunnellingServerState {
  return {
    connections: new Map(),
    nextChannelId: 1,
    nextRequestId: 1,
    puts: new Map(),
    buckets: new Map(),
    counters: ZERO_COUNTERS,
    lineAvailable: true,
  };
}

/** The earliest time a `tick` has something to do (a heartbeat or acknowledgement deadline), or undefined. */
export function nextDeadlineUs(
  config: TunnellingServerConfig,
  state: TunnellingServerState,
): number | undefined {
  let deadline: number | undefined;
  for (const c of state.connections.values()) {
    let at = c.lastHeartbeatUs + config.connectionAliveTimeoutUs;
    if (c.outstanding !== undefined)
      at = Math.min(at, c.outstanding.sentAtUs + config.tunnellingRequestTimeoutUs);
    if (deadline === undefined || at < deadline) deadline = at;
  }
  return deadline;
}

/** Applies one event; see the module comment. */
export function tunnellingServerTransition(
  config: TunnellingServerConfig,
  state: TunnellingServerState,
  event: TunnellingServerEvent,
): TunnellingServerResult {
  const run = new Transition(config, state, event.nowUs);
  switch (event.kind) {
    case "datagram":
      run.datagram(event.from, event.bytes);
      break;
    case "line.frame":
      run.lineFrame(event.frame);
      break;
    case "line.confirmed":
      run.lineConfirmed(event.requestId, event.acknowledged);
      break;
    case "tick":
      run.tick();
      break;
    case "line.state":
      run.lineAvailable = event.available;
      break;
    case "disconnect": {
      const connection = run.connections.get(event.channelId);
      if (connection !== undefined) run.close(connection, "operator");
      break;
    }
    case "shutdown":
      for (const connection of [...run.connections.values()]) run.close(connection, "shutdown");
      break;
  }
  return run.result();
}

/** The working copy of one transition: copies of the maps, mutated, then frozen into the result. */
class Transition {
  readonly connections: Map<number, TunnelConnection>;
  private readonly puts: Map<number, { readonly channelId: number; readonly frame: DataFrame }>;
  private buckets: Map<string, { readonly tokens: number; readonly atUs: number }>;
  private counters: TunnellingServerCounters;
  private nextChannelId: number;
  private nextRequestId: number;
  lineAvailable: boolean;
  private readonly effects: TunnellingServerEffect[] = [];

  constructor(
    private readonly config: TunnellingServerConfig,
    private readonly state: TunnellingServerState,
    private readonly nowUs: number,
  ) {
    this.connections = new Map(state.connections);
    this.puts = new Map(state.puts);
    this.buckets = state.buckets as Map<string, { tokens: number; atUs: number }>;
    this.counters = state.counters;
    this.nextChannelId = state.nextChannelId;
    this.nextRequestId = state.nextRequestId;
    this.lineAvailable = state.lineAvailable;
  }

  result(): TunnellingServerResult {
    return {
      state: {
        connections: this.connections,
        nextChannelId: this.nextChannelId,
        nextRequestId: this.nextRequestId,
        puts: this.puts,
        buckets: this.buckets,
        counters: this.counters,
        lineAvailable: this.lineAvailable,
      },
      effects: this.effects,
    };
  }

  // ---------------------------------------------------------------- datagrams

  datagram(from: UdpAddress, bytes: Uint8Array): void {
    this.count("datagrams");
    if (!this.takeToken(from.address)) {
      this.drop(from, "rate-limited", `more than ${this.config.rateLimit.perSecond} datagrams/s`);
      return;
    }
    const decoded = decodeKnxNetIpFrame(bytes);
    if (!decoded.ok) {
      this.drop(from, "malformed", decoded.error.message);
      return;
    }
    const frame = decoded.value;
    switch (frame.service) {
      case "SEARCH_REQUEST":
        this.send(this.replyTo(frame.discoveryEndpoint, from), {
          service: "SEARCH_RESPONSE",
          controlEndpoint: this.ownHpai(),
          dibs: descriptionDibs(this.config),
        });
        return;
      case "DESCRIPTION_REQUEST":
        this.send(this.replyTo(frame.controlEndpoint, from), {
          service: "DESCRIPTION_RESPONSE",
          dibs: descriptionDibs(this.config),
        });
        return;
      case "CONNECT_REQUEST":
        this.connect(frame, from);
        return;
      case "CONNECTIONSTATE_REQUEST": {
        const connection = this.channel(frame.channelId, from);
        if (connection !== undefined)
          this.connections.set(connection.channelId, {
            ...connection,
            lastHeartbeatUs: this.nowUs,
          });
        this.send(this.replyTo(frame.controlEndpoint, from), {
          service: "CONNECTIONSTATE_RESPONSE",
          channelId: frame.channelId,
          status: this.connectionStatus(connection),
        });
        return;
      }
      case "DISCONNECT_REQUEST": {
        const connection = this.channel(frame.channelId, from);
        this.send(this.replyTo(frame.controlEndpoint, from), {
          service: "DISCONNECT_RESPONSE",
          channelId: frame.channelId,
          status: connection === undefined ? STATUS.E_CONNECTION_ID : STATUS.E_NO_ERROR,
        });
        if (connection !== undefined) this.forget(connection, "client");
        return;
      }
      case "DISCONNECT_RESPONSE":
        return; // the answer to our own DISCONNECT_REQUEST; the channel is already gone
      case "TUNNELLING_REQUEST":
        this.tunnellingRequest(frame, from);
        return;
      case "TUNNELLING_ACK":
        this.tunnellingAck(frame, from);
        return;
      default:
        this.drop(from, "unsupported", `a server does not take ${frame.service}`);
    }
  }

  private connect(frame: FrameOf<"CONNECT_REQUEST">, from: UdpAddress): void {
    const controlEndpoint = this.replyTo(frame.controlEndpoint, from);
    const refuse = (status: number) =>
      this.send(controlEndpoint, { service: "CONNECT_RESPONSE", channelId: 0, status });
    if (frame.controlEndpoint.protocol !== "udp" || frame.dataEndpoint.protocol !== "udp")
      return refuse(STATUS.E_HOST_PROTOCOL_TYPE);
    const { cri } = frame;
    if (cri.connectionType !== CONNECTION_TYPE.TUNNEL_CONNECTION)
      return refuse(STATUS.E_CONNECTION_TYPE);
    if (cri.data.length !== 2) return refuse(STATUS.E_CONNECTION_OPTION);
    if (cri.data[0] !== TUNNEL_LAYER.LINK_LAYER) return refuse(STATUS.E_TUNNELLING_LAYER);
    const used = new Set([...this.connections.values()].map((c) => c.individualAddress));
    const individualAddress = this.config.tunnelAddresses.find((a) => !used.has(a));
    const channelId = this.freeChannelId();
    if (individualAddress === undefined || channelId === undefined)
      return refuse(STATUS.E_NO_MORE_CONNECTIONS);
    this.nextChannelId = channelId === 255 ? 1 : channelId + 1;
    const connection: TunnelConnection = {
      channelId,
      individualAddress,
      client: from,
      controlEndpoint,
      dataEndpoint: this.replyTo(frame.dataEndpoint, from),
      connectedAtUs: this.nowUs,
      lastHeartbeatUs: this.nowUs,
      receiveSequence: 0,
      sendSequence: 0,
      outstanding: undefined,
      queue: [],
      pendingPuts: 0,
      telegramsIn: 0,
      telegramsOut: 0,
    };
    this.connections.set(channelId, connection);
    this.send(controlEndpoint, {
      service: "CONNECT_RESPONSE",
      channelId,
      status: STATUS.E_NO_ERROR,
      granted: { dataEndpoint: this.ownHpai(), crd: tunnelCrd(individualAddress) },
    });
    this.effects.push({ kind: "tunnel.opened", connection });
  }

  private tunnellingRequest(frame: FrameOf<"TUNNELLING_REQUEST">, from: UdpAddress): void {
    const connection = this.channel(frame.channelId, from);
    if (connection === undefined) {
      this.drop(
        from,
        "unknown-channel",
        `no tunnel on channel ${frame.channelId} for ${from.address}`,
      );
      return;
    }
    const ack = () =>
      this.send(connection.dataEndpoint, {
        service: "TUNNELLING_ACK",
        channelId: connection.channelId,
        sequenceCounter: frame.sequenceCounter,
        status: STATUS.E_NO_ERROR,
      });
    const expected = connection.receiveSequence;
    if (frame.sequenceCounter === ((expected + 255) & 0xff)) {
      // A repetition of the request already taken: its acknowledgement was lost.
      this.count("repeated");
      ack();
      return;
    }
    if (frame.sequenceCounter !== expected) {
      this.drop(
        from,
        "out-of-sequence",
        `channel ${connection.channelId}: sequence ${frame.sequenceCounter}, expected ${expected}`,
      );
      return;
    }
    let current: TunnelConnection = { ...connection, receiveSequence: (expected + 1) & 0xff };
    this.connections.set(current.channelId, current);
    ack();
    const cemi = frame.cemi;
    if (cemi[0] !== CEMI_MESSAGE_CODES["L_Data.req"]) {
      this.drop(from, "unsupported", `cEMI message code ${cemi[0]} is not L_Data.req`);
      return;
    }
    if (this.toOtherTunnel(current, cemi)) return;
    const decoded = decodeCemi(cemi);
    if (!decoded.ok) {
      // Taken, but not a frame the line models (individual or extended): confirm negatively.
      const confirmation = negativeConfirmation(cemi);
      if (confirmation === undefined) this.drop(from, "malformed", decoded.error.message);
      else this.enqueue(current.channelId, confirmation);
      return;
    }
    const frameOnLine: DataFrame = {
      ...decoded.value.frame,
      source: current.individualAddress,
      repeated: false,
    };
    if (!this.lineAvailable || current.pendingPuts >= this.config.maxPendingPerTunnel) {
      this.count("putsRefused");
      this.enqueue(
        current.channelId,
        encodeCemi({ messageCode: "L_Data.con", frame: frameOnLine, confirmError: true }),
      );
      return;
    }
    const requestId = this.nextRequestId++;
    current = {
      ...current,
      pendingPuts: current.pendingPuts + 1,
      telegramsIn: current.telegramsIn + 1,
    };
    this.connections.set(current.channelId, current);
    this.puts.set(requestId, { channelId: current.channelId, frame: frameOnLine });
    this.effects.push({ kind: "line.put", requestId, frame: frameOnLine });
  }

  private tunnellingAck(frame: FrameOf<"TUNNELLING_ACK">, from: UdpAddress): void {
    const connection = this.channel(frame.channelId, from);
    if (connection === undefined) {
      this.drop(
        from,
        "unknown-channel",
        `no tunnel on channel ${frame.channelId} for ${from.address}`,
      );
      return;
    }
    // An acknowledgement of anything but the outstanding request, or with an error, changes nothing:
    // the outstanding request is repeated on its timeout.
    if (
      connection.outstanding === undefined ||
      frame.sequenceCounter !== connection.sendSequence ||
      frame.status !== STATUS.E_NO_ERROR
    )
      return;
    const [next, ...rest] = connection.queue;
    const sendSequence = (connection.sendSequence + 1) & 0xff;
    if (next === undefined) {
      this.connections.set(connection.channelId, {
        ...connection,
        sendSequence,
        outstanding: undefined,
      });
      return;
    }
    this.connections.set(
      connection.channelId,
      this.transmit({ ...connection, sendSequence, queue: rest }, next),
    );
  }

  /**
   * An individually addressed L_Data.req to another tunnel's individual address
   * is delivered by that address: the interface owns it, so the frame goes to
   * that tunnel as L_Data.ind, from the sending tunnel's address, and the sender
   * gets a positive L_Data.con (from memory: an interface with several tunnel
   * addresses answers for each of them, KNXnet/IP Tunnelling 03_08_04). Its
   * octets after the addresses (TPCI, APCI, data) travel as they came: device
   * management between two clients needs no model of its own here. False when
   * the frame is not such a frame (group, or for another address).
   */
  private toOtherTunnel(sender: TunnelConnection, cemi: Uint8Array): boolean {
    const header = standardHeader(cemi);
    if (header === undefined || header.group) return false;
    const target = [...this.connections.values()].find(
      (c) => c.individualAddress === header.destination && c.channelId !== sender.channelId,
    );
    if (target === undefined) return false;
    const withSource = (code: number) => {
      const copy = cemi.slice();
      copy[0] = code;
      copy[header.at] = (copy[header.at] as number) & 0xfe; // confirm bit clear
      copy[header.at + 2] = sender.individualAddress >> 8;
      copy[header.at + 3] = sender.individualAddress & 0xff;
      return copy;
    };
    this.connections.set(sender.channelId, { ...sender, telegramsIn: sender.telegramsIn + 1 });
    if (this.enqueue(target.channelId, withSource(CEMI_MESSAGE_CODES["L_Data.ind"]))) {
      const current = this.connections.get(target.channelId)!;
      this.connections.set(target.channelId, {
        ...current,
        telegramsOut: current.telegramsOut + 1,
      });
    }
    this.enqueue(sender.channelId, withSource(CEMI_MESSAGE_CODES["L_Data.con"]));
    return true;
  }

  // ---------------------------------------------------------------- the line

  lineFrame(frame: DataFrame): void {
    let cemi: Uint8Array | undefined;
    for (const connection of [...this.connections.values()]) {
      if (connection.individualAddress === frame.source) continue;
      // A link-layer tunnel hears group frames and the individual frames addressed to it,
      // not other stations' point-to-point traffic (from memory: KNXnet/IP Tunnelling 03_08_04).
      if (frame.addressType === "individual" && frame.destination !== connection.individualAddress)
        continue;
      cemi ??= encodeCemi({ messageCode: "L_Data.ind", frame });
      if (this.enqueue(connection.channelId, cemi)) {
        const current = this.connections.get(connection.channelId)!;
        this.connections.set(connection.channelId, {
          ...current,
          telegramsOut: current.telegramsOut + 1,
        });
      }
    }
  }

  lineConfirmed(requestId: number, acknowledged: boolean): void {
    const put = this.puts.get(requestId);
    if (put === undefined) return;
    this.puts.delete(requestId);
    const connection = this.connections.get(put.channelId);
    if (connection === undefined) return;
    this.connections.set(connection.channelId, {
      ...connection,
      pendingPuts: connection.pendingPuts - 1,
    });
    this.enqueue(
      connection.channelId,
      encodeCemi({ messageCode: "L_Data.con", frame: put.frame, confirmError: !acknowledged }),
    );
  }

  // ---------------------------------------------------------------- time

  tick(): void {
    const { connectionAliveTimeoutUs, tunnellingRequestTimeoutUs } = this.config;
    for (const connection of [...this.connections.values()]) {
      if (this.nowUs - connection.lastHeartbeatUs >= connectionAliveTimeoutUs) {
        this.close(connection, "heartbeat");
        continue;
      }
      const outstanding = connection.outstanding;
      if (
        outstanding === undefined ||
        this.nowUs - outstanding.sentAtUs < tunnellingRequestTimeoutUs
      )
        continue;
      if (outstanding.attempt === 2) {
        this.close(connection, "ack-timeout");
        continue;
      }
      this.effects.push({ kind: "send", to: connection.dataEndpoint, bytes: outstanding.bytes });
      this.connections.set(connection.channelId, {
        ...connection,
        outstanding: { bytes: outstanding.bytes, sentAtUs: this.nowUs, attempt: 2 },
      });
    }
  }

  // ---------------------------------------------------------------- helpers

  /** The status of a connection-state response (see the module comment). */
  private connectionStatus(connection: TunnelConnection | undefined): number {
    if (connection === undefined) return STATUS.E_CONNECTION_ID;
    if (!this.lineAvailable) return STATUS.E_KNX_CONNECTION;
    if (connection.outstanding?.attempt === 2) return STATUS.E_DATA_CONNECTION;
    return STATUS.E_NO_ERROR;
  }

  /** Closes a tunnel from the server side: DISCONNECT_REQUEST to the client's control endpoint. */
  close(connection: TunnelConnection, reason: CloseReason): void {
    this.send(connection.controlEndpoint, {
      service: "DISCONNECT_REQUEST",
      channelId: connection.channelId,
      controlEndpoint: this.ownHpai(),
    });
    this.forget(connection, reason);
  }

  private forget(connection: TunnelConnection, reason: CloseReason): void {
    this.connections.delete(connection.channelId);
    for (const [id, put] of [...this.puts])
      if (put.channelId === connection.channelId) this.puts.delete(id);
    this.effects.push({ kind: "tunnel.closed", connection, reason });
  }

  /** Sends a cEMI message now or queues it behind the outstanding one; false when the queue is full. */
  private enqueue(channelId: number, cemi: Uint8Array): boolean {
    const connection = this.connections.get(channelId)!;
    if (connection.outstanding === undefined) {
      this.connections.set(channelId, this.transmit(connection, cemi));
      return true;
    }
    if (connection.queue.length >= this.config.maxQueuedPerTunnel) {
      this.drop(undefined, "queue-overflow", `channel ${channelId}: client is not acknowledging`);
      return false;
    }
    this.connections.set(channelId, { ...connection, queue: [...connection.queue, cemi] });
    return true;
  }

  private transmit(connection: TunnelConnection, cemi: Uint8Array): TunnelConnection {
    const bytes = encodeKnxNetIpFrame({
      service: "TUNNELLING_REQUEST",
      channelId: connection.channelId,
      sequenceCounter: connection.sendSequence,
      cemi,
    });
    this.effects.push({ kind: "send", to: connection.dataEndpoint, bytes });
    return { ...connection, outstanding: { bytes, sentAtUs: this.nowUs, attempt: 1 } };
  }

  /** The connection on `channelId` if the datagram comes from the IP address that opened it. */
  private channel(channelId: number, from: UdpAddress): TunnelConnection | undefined {
    const connection = this.connections.get(channelId);
    return connection !== undefined && connection.client.address === from.address
      ? connection
      : undefined;
  }

  private freeChannelId(): number | undefined {
    for (let i = 0; i < 255; i++) {
      const id = ((this.nextChannelId - 1 + i) % 255) + 1;
      if (!this.connections.has(id)) return id;
    }
    return undefined;
  }

  /** Where to answer an HPAI: the datagram's source for the route-back form or an address we may not reach. */
  private replyTo(hpai: Hpai, from: UdpAddress): UdpAddress {
    if (isRouteBack(hpai) || hpai.protocol !== "udp" || !this.config.canReach(hpai.address, from))
      return from;
    return { address: hpai.address, port: hpai.port };
  }

  private ownHpai(): Hpai {
    return { protocol: "udp", ...this.config.endpoint };
  }

  private send(to: UdpAddress, frame: Parameters<typeof encodeKnxNetIpFrame>[0]): void {
    this.effects.push({ kind: "send", to, bytes: encodeKnxNetIpFrame(frame) });
  }

  private takeToken(address: string): boolean {
    const { perSecond, burst } = this.config.rateLimit;
    const previous = this.buckets.get(address);
    const tokens =
      previous === undefined
        ? burst
        : Math.min(burst, previous.tokens + ((this.nowUs - previous.atUs) * perSecond) / 1e6);
    if (this.buckets === this.state.buckets) this.buckets = new Map(this.buckets);
    this.buckets.delete(address); // re-inserted last: the map's order is least recently seen first
    if (this.buckets.size >= this.config.maxRateLimitEntries)
      this.buckets.delete(this.buckets.keys().next().value as string);
    const allowed = tokens >= 1;
    this.buckets.set(address, { tokens: allowed ? tokens - 1 : tokens, atUs: this.nowUs });
    return allowed;
  }

  private drop(from: UdpAddress | undefined, reason: DropReason, detail: string): void {
    this.count(DROP_COUNTERS[reason]);
    this.effects.push({ kind: "dropped", from, reason, detail });
  }

  private count(counter: keyof TunnellingServerCounters): void {
    this.counters = { ...this.counters, [counter]: this.counters[counter] + 1 };
  }
}

/**
 * An L_Data.con with the confirm bit set for an L_Data.req the engine cannot put
 * on its line, built from the request's own octets (message code 0x2E, Ctrl1 bit 0);
 * undefined when the octets are too short to hold a control field.
 */
function negativeConfirmation(cemi: Uint8Array): Uint8Array | undefined {
  if (cemi.length < 2) return undefined;
  const at = 2 + (cemi[1] as number);
  if (cemi.length <= at) return undefined;
  const confirmation = cemi.slice();
  confirmation[0] = CEMI_MESSAGE_CODES["L_Data.con"];
  confirmation[at] = (confirmation[at] as number) | 0x01;
  return confirmation;
}

/**
 * Where the control fields of a cEMI L_Data frame start, its destination and
 * address type, when its octets hold a whole standard frame (the length octet
 * matches); undefined otherwise.
 */
function standardHeader(
  cemi: Uint8Array,
): { readonly at: number; readonly destination: number; readonly group: boolean } | undefined {
  if (cemi.length < 2) return undefined;
  const at = 2 + (cemi[1] as number);
  if (cemi.length < at + 9) return undefined;
  const length = cemi[at + 6] as number;
  if (length > 15 || cemi.length !== at + 8 + length) return undefined;
  if (((cemi[at] as number) & 0xd0) !== 0x90) return undefined;
  return {
    at,
    destination: ((cemi[at + 4] as number) << 8) | (cemi[at + 5] as number),
    group: ((cemi[at + 1] as number) & 0x80) !== 0,
  };
}
