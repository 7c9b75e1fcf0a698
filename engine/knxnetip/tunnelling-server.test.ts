/*
 * The tunnelling server's behaviour against the KNXnet/IP spec (source key in
 * knx-reference.md: KNX Standard 03_08_02 Core, 03_08_04 Tunnelling, ISO 22510;
 * section numbers from memory). Status codes and timeouts are knx-reference.md's.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { decodeCemi, encodeCemi } from "../frame/cemi";
import type { DataFrame } from "../frame/data-frame";
import { STATUS } from "./constants";
import { crdIndividualAddress, tunnelCri } from "./connection-info";
import { ROUTE_BACK_HPAI, type Hpai } from "./hpai";
import { decodeKnxNetIpFrame, encodeKnxNetIpFrame, type KnxNetIpFrame } from "./knxnetip-frame";
import {
  tunnellingServerConfig,
  type TunnellingServerConfig,
  type UdpAddress,
} from "./server-config";
import {
  initialTunnellingServerState,
  nextDeadlineUs,
  tunnellingServerTransition,
  type TunnellingServerEffect,
  type TunnellingServerEvent,
  type TunnellingServerState,
} from "./tunnelling-server";
import { knxNetIpFrameArbitrary } from "../../test/harness/knxnetip-fixtures";

const SERVER: UdpAddress = { address: "127.0.0.1", port: 3671 };
const CLIENT_A: UdpAddress = { address: "127.0.0.1", port: 50001 };
const CLIENT_B: UdpAddress = { address: "127.0.0.1", port: 50002 };
const TUNNEL_A = 0x11f1; // 1.1.241
const TUNNEL_B = 0x11f2; // 1.1.242
const S = 1_000_000;

function harness(overrides: Partial<TunnellingServerConfig> = {}) {
  const config = tunnellingServerConfig({
    endpoint: SERVER,
    individualAddress: 0x11f0,
    tunnelAddresses: [TUNNEL_A, TUNNEL_B],
    ...overrides,
  });
  let state: TunnellingServerState = initialTunnellingServerState();
  let nowUs = 0;
  const h = {
    config,
    get state() {
      return state;
    },
    at(timeUs: number) {
      nowUs = timeUs;
      return h;
    },
    apply(event: TunnellingServerEvent): TunnellingServerEffect[] {
      const result = tunnellingServerTransition(config, state, event);
      state = result.state;
      return [...result.effects];
    },
    receive(from: UdpAddress, frame: KnxNetIpFrame | Uint8Array) {
      const bytes = frame instanceof Uint8Array ? frame : encodeKnxNetIpFrame(frame);
      return h.apply({ kind: "datagram", nowUs, from, bytes });
    },
    tick() {
      return h.apply({ kind: "tick", nowUs });
    },
    connect(from: UdpAddress): number {
      const effects = h.receive(from, connectRequest());
      const response = sent(effects)[0]!;
      if (response.frame.service !== "CONNECT_RESPONSE") throw new Error("no connect response");
      return response.frame.channelId;
    },
  };
  return h;
}

function connectRequest(cri = tunnelCri(), protocol: Hpai["protocol"] = "udp"): KnxNetIpFrame {
  return {
    service: "CONNECT_REQUEST",
    controlEndpoint: { ...ROUTE_BACK_HPAI, protocol },
    dataEndpoint: ROUTE_BACK_HPAI,
    cri,
  };
}

/** The datagrams among the effects, decoded. */
function sent(effects: readonly TunnellingServerEffect[]) {
  return effects.flatMap((e) => {
    if (e.kind !== "send") return [];
    const decoded = decodeKnxNetIpFrame(e.bytes);
    if (!decoded.ok) throw new Error(`server sent undecodable octets: ${decoded.error.message}`);
    return [{ to: e.to, frame: decoded.value }];
  });
}

const write2102: DataFrame = {
  priority: "low",
  repeated: false,
  source: 0, // clients commonly send 0.0.0 and let the interface fill in its address
  destination: 0x1002, // 2/0/2
  addressType: "group",
  hopCount: 6,
  service: "GroupValue_Write",
  payload: Uint8Array.of(0x0c, 0x1a), // 21.00 °C, DPT spec §3.10
  shortPayload: false,
};

function request(channelId: number, sequenceCounter: number, frame = write2102): KnxNetIpFrame {
  return {
    service: "TUNNELLING_REQUEST",
    channelId,
    sequenceCounter,
    cemi: encodeCemi({ messageCode: "L_Data.req", frame, ackRequest: true }),
  };
}

/** A client's heartbeat on its channel (Core §5.4: CONNECTIONSTATE_REQUEST). */
function heartbeatRequest(channelId: number): KnxNetIpFrame {
  return { service: "CONNECTIONSTATE_REQUEST", channelId, controlEndpoint: ROUTE_BACK_HPAI };
}

function cemiOf(frame: KnxNetIpFrame) {
  if (frame.service !== "TUNNELLING_REQUEST") throw new Error(frame.service);
  const cemi = decodeCemi(frame.cemi);
  if (!cemi.ok) throw new Error(cemi.error.message);
  return { ...cemi.value, sequenceCounter: frame.sequenceCounter, channelId: frame.channelId };
}

describe("tunnelling server: search, description, connect", () => {
  it("answers search and description requests with device information and service families (Core §7.6, §7.7)", () => {
    const h = harness();
    const [search] = sent(
      h.receive(CLIENT_A, { service: "SEARCH_REQUEST", discoveryEndpoint: ROUTE_BACK_HPAI }),
    );
    expect(search!.to).toEqual(CLIENT_A); // route back: answered where it came from (Core §8.6.3)
    expect(search!.frame).toMatchObject({
      service: "SEARCH_RESPONSE",
      controlEndpoint: { protocol: "udp", ...SERVER },
    });
    const [description] = sent(
      h.receive(CLIENT_A, {
        service: "DESCRIPTION_REQUEST",
        controlEndpoint: { protocol: "udp", address: "127.0.0.1", port: 40000 },
      }),
    );
    expect(description!.to).toEqual({ address: "127.0.0.1", port: 40000 });
    if (description!.frame.service !== "DESCRIPTION_RESPONSE") throw new Error("service");
    expect(description!.frame.dibs[0]).toMatchObject({
      kind: "device-info",
      medium: 0x02,
      individualAddress: 0x11f0,
    });
    // Core v1 (0x02) and tunnelling v1 (0x04), from memory.
    expect(description!.frame.dibs[1]).toEqual({
      kind: "service-families",
      families: [
        { id: 0x02, version: 1 },
        { id: 0x04, version: 1 },
      ],
    });
  });

  it("answers an HPAI naming another IP address than the datagram's source at the source (no reflection)", () => {
    const h = harness();
    const [reply] = sent(
      h.receive(CLIENT_A, {
        service: "DESCRIPTION_REQUEST",
        controlEndpoint: { protocol: "udp", address: "192.0.2.7", port: 3671 },
      }),
    );
    expect(reply!.to).toEqual(CLIENT_A);
  });

  it("grants a link-layer tunnel its own channel and individual address from the pool (Tunnelling §4.4.4)", () => {
    const h = harness();
    const effects = h.receive(CLIENT_A, connectRequest());
    const [response] = sent(effects);
    if (response!.frame.service !== "CONNECT_RESPONSE") throw new Error("service");
    expect(response!.frame.status).toBe(STATUS.E_NO_ERROR);
    expect(response!.frame.granted?.dataEndpoint).toEqual({ protocol: "udp", ...SERVER });
    expect(crdIndividualAddress(response!.frame.granted!.crd)).toBe(TUNNEL_A);
    expect(effects.some((e) => e.kind === "tunnel.opened")).toBe(true);
    const [second] = sent(h.receive(CLIENT_B, connectRequest()));
    if (second!.frame.service !== "CONNECT_RESPONSE") throw new Error("service");
    expect(crdIndividualAddress(second!.frame.granted!.crd)).toBe(TUNNEL_B);
    expect(second!.frame.channelId).not.toBe(response!.frame.channelId);
  });

  it.each([
    ["a full table", connectRequest(), STATUS.E_NO_MORE_CONNECTIONS, 2],
    [
      "device management",
      connectRequest({ connectionType: 0x03, data: new Uint8Array(0) }),
      STATUS.E_CONNECTION_TYPE,
      0,
    ],
    ["a busmonitor tunnel", connectRequest(tunnelCri(0x80)), STATUS.E_TUNNELLING_LAYER, 0],
    ["a raw tunnel", connectRequest(tunnelCri(0x04)), STATUS.E_TUNNELLING_LAYER, 0],
    [
      "an extended CRI",
      connectRequest({ connectionType: 0x04, data: Uint8Array.of(2, 0, 0x11, 0xf5) }),
      STATUS.E_CONNECTION_OPTION,
      0,
    ],
    ["TCP", connectRequest(tunnelCri(), "tcp"), STATUS.E_HOST_PROTOCOL_TYPE, 0],
  ])("refuses %s with its status code (Core §7.8.5)", (_, frame, status, before) => {
    const h = harness();
    for (let i = 0; i < before; i++) h.connect({ address: "127.0.0.1", port: 41000 + i });
    const [response] = sent(h.receive(CLIENT_A, frame));
    expect(response!.frame).toEqual({ service: "CONNECT_RESPONSE", channelId: 0, status });
    expect(h.state.connections.size).toBe(before);
  });
});

describe("tunnelling server: tunnelling requests from the client", () => {
  it("acknowledges with the same sequence counter and puts the frame on the line from the tunnel's address", () => {
    const h = harness();
    const channel = h.connect(CLIENT_A);
    const effects = h.receive(CLIENT_A, request(channel, 0));
    expect(sent(effects)[0]!.frame).toEqual({
      service: "TUNNELLING_ACK",
      channelId: channel,
      sequenceCounter: 0,
      status: STATUS.E_NO_ERROR,
    });
    const put = effects.find((e) => e.kind === "line.put");
    expect(put).toMatchObject({ frame: { ...write2102, source: TUNNEL_A } });
  });

  it("answers L_Data.con after the line acknowledged, with the confirm bit when it did not", () => {
    const h = harness();
    const channel = h.connect(CLIENT_A);
    const put1 = h.receive(CLIENT_A, request(channel, 0)).find((e) => e.kind === "line.put")!;
    const put2 = h.receive(CLIENT_A, request(channel, 1)).find((e) => e.kind === "line.put")!;
    if (put1.kind !== "line.put" || put2.kind !== "line.put") throw new Error("put");
    const con1 = sent(
      h.at(20_000).apply({
        kind: "line.confirmed",
        nowUs: 20_000,
        requestId: put1.requestId,
        acknowledged: true,
      }),
    );
    expect(cemiOf(con1[0]!.frame)).toMatchObject({
      messageCode: "L_Data.con",
      confirmError: false,
      sequenceCounter: 0,
      frame: { source: TUNNEL_A, destination: 0x1002 },
    });
    h.receive(CLIENT_A, {
      service: "TUNNELLING_ACK",
      channelId: channel,
      sequenceCounter: 0,
      status: 0,
    });
    const con2 = sent(
      h.apply({
        kind: "line.confirmed",
        nowUs: 90_000,
        requestId: put2.requestId,
        acknowledged: false,
      }),
    );
    expect(cemiOf(con2[0]!.frame)).toMatchObject({
      messageCode: "L_Data.con",
      confirmError: true,
      sequenceCounter: 1,
    });
  });

  it("acknowledges a repeated request again but does not execute it twice (Tunnelling §2.6)", () => {
    const h = harness();
    const channel = h.connect(CLIENT_A);
    h.receive(CLIENT_A, request(channel, 0));
    const again = h.receive(CLIENT_A, request(channel, 0));
    expect(sent(again).map((s) => s.frame)).toEqual([
      { service: "TUNNELLING_ACK", channelId: channel, sequenceCounter: 0, status: 0 },
    ]);
    expect(again.some((e) => e.kind === "line.put")).toBe(false);
    expect(h.state.counters.repeated).toBe(1);
  });

  it("drops a request out of sequence without acknowledging it (Tunnelling §2.6)", () => {
    const h = harness();
    const channel = h.connect(CLIENT_A);
    const effects = h.receive(CLIENT_A, request(channel, 5));
    expect(sent(effects)).toEqual([]);
    expect(effects.some((e) => e.kind === "line.put")).toBe(false);
    expect(h.state.counters.outOfSequence).toBe(1);
    // The expected one still works afterwards.
    expect(h.receive(CLIENT_A, request(channel, 0)).some((e) => e.kind === "line.put")).toBe(true);
  });

  it("wraps the sequence counter after 255", () => {
    const h = harness({ maxPendingPerTunnel: 1000, rateLimit: { perSecond: 1e6, burst: 1e6 } });
    const channel = h.connect(CLIENT_A);
    for (let i = 0; i < 258; i++)
      expect(
        h.receive(CLIENT_A, request(channel, i & 0xff)).some((e) => e.kind === "line.put"),
      ).toBe(true);
  });

  it("confirms negatively at once when the tunnel already has as many frames waiting as allowed", () => {
    const h = harness({ maxPendingPerTunnel: 1 });
    const channel = h.connect(CLIENT_A);
    h.receive(CLIENT_A, request(channel, 0));
    const effects = h.receive(CLIENT_A, request(channel, 1));
    expect(effects.some((e) => e.kind === "line.put")).toBe(false);
    expect(cemiOf(sent(effects)[1]!.frame)).toMatchObject({
      messageCode: "L_Data.con",
      confirmError: true,
    });
    expect(h.state.counters.putsRefused).toBe(1);
  });

  it("refuses tunnelling requests for a channel from another IP address or an unknown channel", () => {
    const h = harness();
    const channel = h.connect(CLIENT_A);
    expect(h.receive({ address: "127.0.0.2", port: 50001 }, request(channel, 0))).toMatchObject([
      { kind: "dropped", reason: "unknown-channel" },
    ]);
    expect(h.receive(CLIENT_A, request(channel + 1, 0))).toMatchObject([
      { kind: "dropped", reason: "unknown-channel" },
    ]);
    expect(h.state.counters.unknownChannel).toBe(2);
  });

  it("counts and drops malformed datagrams without disturbing a tunnel", () => {
    const h = harness();
    const channel = h.connect(CLIENT_A);
    expect(h.receive(CLIENT_A, Uint8Array.of(6, 0x10, 4, 0x20, 0, 99))).toMatchObject([
      { kind: "dropped", reason: "malformed" },
    ]);
    expect(h.state.counters.malformed).toBe(1);
    expect(h.receive(CLIENT_A, request(channel, 0)).some((e) => e.kind === "line.put")).toBe(true);
  });

  it("limits the datagram rate per client address (token bucket)", () => {
    const h = harness({ rateLimit: { perSecond: 10, burst: 3 } });
    const search: KnxNetIpFrame = { service: "SEARCH_REQUEST", discoveryEndpoint: ROUTE_BACK_HPAI };
    for (let i = 0; i < 3; i++) expect(sent(h.receive(CLIENT_A, search))).toHaveLength(1);
    expect(h.receive(CLIENT_A, search)).toMatchObject([
      { kind: "dropped", reason: "rate-limited" },
    ]);
    // Another address has its own bucket; time refills the first (10/s: one token per 100 ms).
    expect(sent(h.receive({ address: "127.0.0.9", port: 1 }, search))).toHaveLength(1);
    expect(sent(h.at(100_000).receive(CLIENT_A, search))).toHaveLength(1);
    expect(h.state.counters.rateLimited).toBe(1);
  });
});

describe("tunnelling server: frames on the line to the clients", () => {
  const statusTelegram: DataFrame = { ...write2102, source: 0x1114, destination: 0x1102 };

  it("sends every frame on the line as L_Data.ind to each tunnel but the one that sent it", () => {
    const h = harness();
    const a = h.connect(CLIENT_A);
    const b = h.connect(CLIENT_B);
    const fromDevice = sent(h.apply({ kind: "line.frame", nowUs: 0, frame: statusTelegram }));
    expect(fromDevice.map((s) => [s.to.port, cemiOf(s.frame).messageCode])).toEqual([
      [CLIENT_A.port, "L_Data.ind"],
      [CLIENT_B.port, "L_Data.ind"],
    ]);
    h.receive(CLIENT_A, { service: "TUNNELLING_ACK", channelId: a, sequenceCounter: 0, status: 0 });
    h.receive(CLIENT_B, { service: "TUNNELLING_ACK", channelId: b, sequenceCounter: 0, status: 0 });
    const fromTunnelA = sent(
      h.apply({ kind: "line.frame", nowUs: 0, frame: { ...write2102, source: TUNNEL_A } }),
    );
    expect(fromTunnelA.map((s) => s.to.port)).toEqual([CLIENT_B.port]);
    expect(cemiOf(fromTunnelA[0]!.frame)).toMatchObject({
      sequenceCounter: 1,
      frame: { source: TUNNEL_A },
    });
    expect(h.state.connections.get(b)?.telegramsOut).toBe(2);
  });

  it("delivers an individually addressed frame to another tunnel's address as L_Data.ind and confirms it", () => {
    const h = harness();
    const a = h.connect(CLIENT_A);
    const b = h.connect(CLIENT_B);
    // cEMI L_Data.req (knx-reference.md, cEMI layout): no additional info, Ctrl1 0xBC (standard,
    // not repeated, low priority), Ctrl2 0x60 (individual address, hop count 6), source 0.0.0,
    // destination 1.1.242, length 1, TPCI/APCI 0x03 0x00: an A_DeviceDescriptor_Read (from memory).
    const cemi = Uint8Array.of(0x11, 0x00, 0xbc, 0x60, 0x00, 0x00, 0x11, 0xf2, 0x01, 0x03, 0x00);
    const effects = h.receive(CLIENT_A, {
      service: "TUNNELLING_REQUEST",
      channelId: a,
      sequenceCounter: 0,
      cemi,
    });
    expect(effects.some((e) => e.kind === "line.put")).toBe(false);
    const frames = sent(effects);
    expect(frames.map((f) => [f.to.port, f.frame.service])).toEqual([
      [CLIENT_A.port, "TUNNELLING_ACK"],
      [CLIENT_B.port, "TUNNELLING_REQUEST"],
      [CLIENT_A.port, "TUNNELLING_REQUEST"],
    ]);
    const toB = frames[1]!.frame;
    const toA = frames[2]!.frame;
    if (toB.service !== "TUNNELLING_REQUEST" || toA.service !== "TUNNELLING_REQUEST")
      throw new Error("no tunnelling requests");
    expect(toB.channelId).toBe(b);
    // L_Data.ind 0x29 and L_Data.con 0x2E, from the sending tunnel's address 1.1.241.
    expect([...toB.cemi]).toEqual([
      0x29, 0x00, 0xbc, 0x60, 0x11, 0xf1, 0x11, 0xf2, 0x01, 0x03, 0x00,
    ]);
    expect([...toA.cemi]).toEqual([
      0x2e, 0x00, 0xbc, 0x60, 0x11, 0xf1, 0x11, 0xf2, 0x01, 0x03, 0x00,
    ]);
    expect(h.state.connections.get(a)).toMatchObject({ telegramsIn: 1 });
    expect(h.state.connections.get(b)).toMatchObject({ telegramsOut: 1 });

    // To an address no tunnel has (a bench device): the line does not carry it, so L_Data.con
    // comes back with the confirm bit set.
    h.receive(CLIENT_B, {
      service: "TUNNELLING_ACK",
      channelId: b,
      sequenceCounter: toB.sequenceCounter,
      status: STATUS.E_NO_ERROR,
    });
    const toDevice = cemi.slice();
    toDevice[7] = 0x02; // 1.1.2
    const [, refused] = sent(
      h.receive(CLIENT_B, {
        service: "TUNNELLING_REQUEST",
        channelId: b,
        sequenceCounter: 0,
        cemi: toDevice,
      }),
    );
    if (refused?.frame.service !== "TUNNELLING_REQUEST") throw new Error("no confirmation");
    expect(refused.frame.cemi[0]).toBe(0x2e);
    expect(refused.frame.cemi[2]! & 0x01).toBe(1);
  });

  it("indicates an individually addressed frame on the line only to the tunnel it is addressed to", () => {
    const h = harness();
    const a = h.connect(CLIENT_A);
    h.connect(CLIENT_B);
    const toTunnelA: DataFrame = {
      ...write2102,
      source: 0x1114,
      destination: TUNNEL_A,
      addressType: "individual",
    };
    const toDevice: DataFrame = { ...toTunnelA, destination: 0x1102 };
    expect(sent(h.apply({ kind: "line.frame", nowUs: 0, frame: toDevice }))).toEqual([]);
    const delivered = sent(h.apply({ kind: "line.frame", nowUs: 0, frame: toTunnelA }));
    expect(delivered.map((d) => [d.to.port, d.frame.service])).toEqual([
      [CLIENT_A.port, "TUNNELLING_REQUEST"],
    ]);
    expect(cemiOf(delivered[0]!.frame)).toMatchObject({
      channelId: a,
      messageCode: "L_Data.ind",
      frame: { addressType: "individual", destination: TUNNEL_A },
    });
  });

  it("keeps one request outstanding per tunnel; the next follows the acknowledgement with the next counter", () => {
    const h = harness();
    const a = h.connect(CLIENT_A);
    expect(sent(h.apply({ kind: "line.frame", nowUs: 0, frame: statusTelegram }))).toHaveLength(1);
    expect(sent(h.apply({ kind: "line.frame", nowUs: 0, frame: statusTelegram }))).toHaveLength(0);
    // An acknowledgement of the wrong counter changes nothing.
    expect(
      sent(
        h.receive(CLIENT_A, {
          service: "TUNNELLING_ACK",
          channelId: a,
          sequenceCounter: 7,
          status: 0,
        }),
      ),
    ).toEqual([]);
    const next = sent(
      h.receive(CLIENT_A, {
        service: "TUNNELLING_ACK",
        channelId: a,
        sequenceCounter: 0,
        status: 0,
      }),
    );
    expect(cemiOf(next[0]!.frame).sequenceCounter).toBe(1);
  });

  it("repeats an unacknowledged request once after 1 s, then closes the tunnel (Tunnelling §2.6)", () => {
    const h = harness();
    const a = h.connect(CLIENT_A);
    const [first] = sent(h.apply({ kind: "line.frame", nowUs: 0, frame: statusTelegram }));
    expect(nextDeadlineUs(h.config, h.state)).toBe(S);
    expect(sent(h.at(S - 1).tick())).toEqual([]);
    const [repeat] = sent(h.at(S).tick());
    expect(repeat).toEqual(first);
    const closing = h.at(2 * S).tick();
    expect(sent(closing)[0]!.frame).toEqual({
      service: "DISCONNECT_REQUEST",
      channelId: a,
      controlEndpoint: { protocol: "udp", ...SERVER },
    });
    expect(closing).toContainEqual(
      expect.objectContaining({ kind: "tunnel.closed", reason: "ack-timeout" }),
    );
    expect(h.state.connections.size).toBe(0);
  });
});

describe("tunnelling server: heartbeat and disconnect", () => {
  it("answers connection-state requests and keeps a tunnel alive while they come (Core §5.4: 120 s)", () => {
    const h = harness();
    const a = h.connect(CLIENT_A);
    const heartbeat = heartbeatRequest(a);
    for (let t = 60; t <= 600; t += 60) {
      expect(sent(h.at(t * S).receive(CLIENT_A, heartbeat))[0]!.frame).toEqual({
        service: "CONNECTIONSTATE_RESPONSE",
        channelId: a,
        status: STATUS.E_NO_ERROR,
      });
      h.tick();
    }
    expect(h.state.connections.size).toBe(1);
    expect(nextDeadlineUs(h.config, h.state)).toBe(720 * S);
    const closing = h.at(720 * S).tick();
    expect(sent(closing)[0]!.frame.service).toBe("DISCONNECT_REQUEST");
    expect(closing).toContainEqual(
      expect.objectContaining({ kind: "tunnel.closed", reason: "heartbeat" }),
    );
    // The channel is gone: the next heartbeat gets E_CONNECTION_ID (knx-reference.md 0x21).
    expect(sent(h.receive(CLIENT_A, heartbeat))[0]!.frame).toMatchObject({
      status: STATUS.E_CONNECTION_ID,
    });
  });

  // Status values: knx-reference.md (KNXnet/IP spec); which response carries them: the Core
  // spec's connection-state response (Core §7.8.4, KNX Standard 03_08_02 / ISO 22510), from memory.
  it("answers a heartbeat with E_DATA_CONNECTION while a request to the client waits on its repetition", () => {
    const h = harness();
    const a = h.connect(CLIENT_A);
    const heartbeat = heartbeatRequest(a);
    const fromDevice: DataFrame = { ...write2102, source: 0x1114, destination: 0x1102 };
    h.apply({ kind: "line.frame", nowUs: 0, frame: fromDevice });
    // Outstanding but not yet overdue: the data connection is fine.
    expect(sent(h.at(S / 2).receive(CLIENT_A, heartbeat))[0]!.frame).toMatchObject({
      status: STATUS.E_NO_ERROR,
    });
    h.at(S).tick(); // unacknowledged for 1 s: sent once more
    expect(sent(h.at(S + S / 2).receive(CLIENT_A, heartbeat))[0]!.frame).toEqual({
      service: "CONNECTIONSTATE_RESPONSE",
      channelId: a,
      status: STATUS.E_DATA_CONNECTION, // 0x26
    });
    // The client acknowledges the repetition: the data connection is healthy again.
    h.receive(CLIENT_A, {
      service: "TUNNELLING_ACK",
      channelId: a,
      sequenceCounter: 0,
      status: STATUS.E_NO_ERROR,
    });
    expect(sent(h.receive(CLIENT_A, heartbeat))[0]!.frame).toMatchObject({
      status: STATUS.E_NO_ERROR,
    });
  });

  it("answers a heartbeat with E_KNX_CONNECTION while the KNX side is down, and confirms frames negatively then", () => {
    const h = harness();
    const a = h.connect(CLIENT_A);
    const heartbeat = heartbeatRequest(a);
    h.apply({ kind: "line.state", nowUs: 0, available: false });
    expect(sent(h.receive(CLIENT_A, heartbeat))[0]!.frame).toEqual({
      service: "CONNECTIONSTATE_RESPONSE",
      channelId: a,
      status: STATUS.E_KNX_CONNECTION, // 0x27
    });
    const effects = h.receive(CLIENT_A, request(a, 0));
    expect(effects.some((e) => e.kind === "line.put")).toBe(false);
    const [ack, confirmation] = sent(effects);
    expect(ack!.frame).toMatchObject({ service: "TUNNELLING_ACK", status: STATUS.E_NO_ERROR });
    expect(cemiOf(confirmation!.frame)).toMatchObject({
      messageCode: "L_Data.con",
      confirmError: true,
    });
    h.apply({ kind: "line.state", nowUs: 0, available: true });
    expect(sent(h.receive(CLIENT_A, heartbeat))[0]!.frame).toMatchObject({
      status: STATUS.E_NO_ERROR,
    });
  });

  it("takes a configurable timeout for tests", () => {
    const h = harness({ connectionAliveTimeoutUs: 300_000 });
    h.connect(CLIENT_A);
    expect(nextDeadlineUs(h.config, h.state)).toBe(300_000);
  });

  it("closes on the client's DISCONNECT_REQUEST and frees the address; an unknown channel gets E_CONNECTION_ID", () => {
    const h = harness();
    const a = h.connect(CLIENT_A);
    const effects = h.receive(CLIENT_A, {
      service: "DISCONNECT_REQUEST",
      channelId: a,
      controlEndpoint: ROUTE_BACK_HPAI,
    });
    expect(sent(effects)[0]!.frame).toEqual({
      service: "DISCONNECT_RESPONSE",
      channelId: a,
      status: STATUS.E_NO_ERROR,
    });
    expect(effects).toContainEqual(
      expect.objectContaining({ kind: "tunnel.closed", reason: "client" }),
    );
    expect(
      sent(
        h.receive(CLIENT_A, {
          service: "DISCONNECT_REQUEST",
          channelId: a,
          controlEndpoint: ROUTE_BACK_HPAI,
        }),
      )[0]!.frame,
    ).toMatchObject({
      status: STATUS.E_CONNECTION_ID,
    });
    const [again] = sent(h.receive(CLIENT_B, connectRequest()));
    if (again!.frame.service !== "CONNECT_RESPONSE") throw new Error("service");
    expect(crdIndividualAddress(again!.frame.granted!.crd)).toBe(TUNNEL_A);
  });

  it("an operator disconnect and a shutdown send DISCONNECT_REQUEST to the clients", () => {
    const h = harness();
    const a = h.connect(CLIENT_A);
    h.connect(CLIENT_B);
    const operator = h.apply({ kind: "disconnect", nowUs: 0, channelId: a });
    expect(sent(operator).map((s) => [s.to.port, s.frame.service])).toEqual([
      [CLIENT_A.port, "DISCONNECT_REQUEST"],
    ]);
    const shutdown = h.apply({ kind: "shutdown", nowUs: 0 });
    expect(sent(shutdown).map((s) => [s.to.port, s.frame.service])).toEqual([
      [CLIENT_B.port, "DISCONNECT_REQUEST"],
    ]);
    expect(h.state.connections.size).toBe(0);
  });
});

describe("tunnelling server: properties", () => {
  const from = fc.constantFrom(CLIENT_A, CLIENT_B, { address: "127.0.0.3", port: 9 });
  const eventArbitrary = fc.oneof(
    fc.record({ kind: fc.constant("frame" as const), from, frame: knxNetIpFrameArbitrary }),
    fc.record({ kind: fc.constant("raw" as const), from, bytes: fc.uint8Array({ maxLength: 40 }) }),
    fc.record({ kind: fc.constant("connect" as const), from }),
    fc.record({
      kind: fc.constant("request" as const),
      from,
      channel: fc.integer({ min: 1, max: 4 }),
      seq: fc.nat(3),
    }),
    fc.record({
      kind: fc.constant("line" as const),
      source: fc.constantFrom(TUNNEL_A, TUNNEL_B, 0x1114),
    }),
    fc.record({
      kind: fc.constant("confirm" as const),
      id: fc.integer({ min: 1, max: 20 }),
      ok: fc.boolean(),
    }),
    fc.record({ kind: fc.constant("time" as const), us: fc.integer({ min: 0, max: 3 * S }) }),
    fc.record({ kind: fc.constant("line-state" as const), available: fc.boolean() }),
    // An individually addressed frame to a tunnel, a device or nobody, with any octets after the addresses.
    fc.record({
      kind: fc.constant("individual" as const),
      from,
      channel: fc.integer({ min: 1, max: 4 }),
      seq: fc.nat(3),
      destination: fc.constantFrom(TUNNEL_A, TUNNEL_B, 0x1102, 0),
      tpdu: fc.uint8Array({ minLength: 1, maxLength: 16 }),
    }),
  );

  it("never throws, keeps the tunnels within the pool and only sends frames that decode", () => {
    fc.assert(
      fc.property(fc.array(eventArbitrary, { maxLength: 60 }), (events) => {
        const h = harness({ connectionAliveTimeoutUs: 5 * S });
        let t = 0;
        for (const e of events) {
          let effects: TunnellingServerEffect[];
          if (e.kind === "frame") effects = h.receive(e.from, e.frame);
          else if (e.kind === "raw") effects = h.receive(e.from, e.bytes);
          else if (e.kind === "connect") effects = h.receive(e.from, connectRequest());
          else if (e.kind === "request") effects = h.receive(e.from, request(e.channel, e.seq));
          else if (e.kind === "line-state")
            effects = h.apply({ kind: "line.state", nowUs: t, available: e.available });
          else if (e.kind === "individual")
            effects = h.receive(e.from, {
              service: "TUNNELLING_REQUEST",
              channelId: e.channel,
              sequenceCounter: e.seq,
              cemi: Uint8Array.of(
                0x11,
                0x00,
                0xbc,
                0x60,
                0x00,
                0x00,
                e.destination >> 8,
                e.destination & 0xff,
                e.tpdu.length - 1,
                ...e.tpdu,
              ),
            });
          else if (e.kind === "line")
            effects = h.apply({
              kind: "line.frame",
              nowUs: t,
              frame: { ...write2102, source: e.source },
            });
          else if (e.kind === "confirm")
            effects = h.apply({
              kind: "line.confirmed",
              nowUs: t,
              requestId: e.id,
              acknowledged: e.ok,
            });
          else effects = h.at((t += e.us)).tick();
          sent(effects);
          const addresses = [...h.state.connections.values()].map((c) => c.individualAddress);
          expect(new Set(addresses).size).toBe(addresses.length);
          expect(addresses.length).toBeLessThanOrEqual(2);
          for (const c of h.state.connections.values()) {
            expect(c.queue.length).toBeLessThanOrEqual(h.config.maxQueuedPerTunnel);
            expect(c.pendingPuts).toBeGreaterThanOrEqual(0);
          }
        }
      }),
      { numRuns: 500 },
    );
  });
});
