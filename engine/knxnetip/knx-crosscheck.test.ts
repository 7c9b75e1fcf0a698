/*
 * Cross-check against the `knx` npm package's own KNXnet/IP writer and reader
 * (src/KnxProtocol.js, src/KnxConstants.js; "Libraries" source in knx-reference.md).
 * Test-only. What the package writes, Benchline decodes to the same fields;
 * what Benchline writes, the package reads back to the same fields.
 *
 * Documented differences:
 * - The package spells the services TUNNELING_*; the specification and Benchline TUNNELLING_*.
 * - The package has no SEARCH/DESCRIPTION writer (it reads a DESCRIPTION_RESPONSE as raw octets),
 *   so only the constants of those services are compared.
 */
// eslint-disable-next-line no-restricted-imports -- test-only: the knx package is CommonJS, so the cross-check needs createRequire
import { createRequire } from "node:module";
import { beforeAll, describe, expect, it } from "vitest";
import { decodeCemi, encodeCemi } from "../frame/cemi";
import { CONNECTION_TYPE, HOST_PROTOCOL, SERVICE_TYPES, STATUS, TUNNEL_LAYER } from "./constants";
import { tunnelCrd } from "./connection-info";
import { decodeKnxNetIpFrame, encodeKnxNetIpFrame } from "./knxnetip-frame";

interface KnxWriter {
  KNXNetHeader(datagram: unknown): { buffer: Buffer };
}
interface KnxReader {
  KNXNetHeader(name: string): KnxReader;
  next(): Record<string, Record<string, unknown>>;
}
interface KnxProtocol {
  createWriter(): KnxWriter;
  createReader(buffer: Buffer): KnxReader;
}
type Constants = Record<string, Record<string, number>>;

let protocol: KnxProtocol;
let constants: Constants;

beforeAll(() => {
  const require = createRequire(import.meta.url);
  const logger = createRequire(require.resolve("knx/package.json"))("log-driver").logger as Record<
    string,
    unknown
  >;
  for (const level of ["error", "warn", "info", "debug", "trace"]) logger[level] = () => undefined;
  protocol = require("knx/src/KnxProtocol.js") as KnxProtocol;
  constants = require("knx/src/KnxConstants.js") as Constants;
});

function theirs(datagram: Record<string, unknown>): Uint8Array {
  return new Uint8Array(protocol.createWriter().KNXNetHeader(datagram).buffer);
}
function readByThem(bytes: Uint8Array): Record<string, unknown> {
  const reader = protocol.createReader(Buffer.from(bytes));
  reader.KNXNetHeader("frame");
  return reader.next()["frame"] as Record<string, unknown>;
}

const cemiTemplate = {
  msgcode: 0x11,
  ctrl: {
    frameType: 1,
    reserved: 0,
    repeat: 1,
    broadcast: 1,
    priority: 3,
    acknowledge: 1,
    confirm: 0,
    destAddrType: 1,
    hopCount: 6,
    extendedFrame: 0,
  },
  src_addr: "1.1.241",
  dest_addr: "2/0/2",
  apdu: { apci: "GroupValue_Write", tpci: 0, data: Buffer.from([0x0c, 0x1a]) },
};

describe("cross-check with the knx package: constants", () => {
  it("has the same service type codes", () => {
    const their = constants["SERVICE_TYPE"]!;
    for (const [name, code] of Object.entries(SERVICE_TYPES))
      expect([name, their[name.replace("TUNNELLING", "TUNNELING")]]).toEqual([name, code]);
  });

  it("has the same status codes, connection types, tunnel layers and host protocols", () => {
    const codes = constants["RESPONSECODE"]!;
    for (const [name, code] of Object.entries(STATUS)) {
      const theirName =
        name === "E_NO_ERROR" ? "NO_ERROR" : name.replace("TUNNELLING", "TUNNELING");
      expect([name, codes[theirName]]).toEqual([name, code]);
    }
    expect(constants["CONNECTION_TYPE"]!["TUNNEL_CONNECTION"]).toBe(
      CONNECTION_TYPE.TUNNEL_CONNECTION,
    );
    expect(constants["CONNECTION_TYPE"]!["DEVICE_MGMT_CONNECTION"]).toBe(
      CONNECTION_TYPE.DEVICE_MGMT_CONNECTION,
    );
    expect(constants["KNX_LAYER"]).toEqual({ ...TUNNEL_LAYER });
    expect(constants["PROTOCOL_TYPE"]).toEqual({ ...HOST_PROTOCOL });
  });
});

describe("cross-check with the knx package: what the client writes, Benchline decodes", () => {
  it("CONNECT_REQUEST with route-back HPAIs and a link-layer tunnel CRI", () => {
    const bytes = theirs({
      service_type: SERVICE_TYPES.CONNECT_REQUEST,
      hpai: { protocol_type: 1, tunnel_endpoint: "0.0.0.0:0" },
      tunn: { protocol_type: 1, tunnel_endpoint: "127.0.0.1:50000" },
      cri: { connection_type: 0x04, knx_layer: 0x02, unused: 0 },
    });
    expect(decodeKnxNetIpFrame(bytes)).toEqual({
      ok: true,
      value: {
        service: "CONNECT_REQUEST",
        controlEndpoint: { protocol: "udp", address: "0.0.0.0", port: 0 },
        dataEndpoint: { protocol: "udp", address: "127.0.0.1", port: 50000 },
        cri: { connectionType: 0x04, data: Uint8Array.of(0x02, 0x00) },
      },
    });
  });

  it("CONNECTIONSTATE_REQUEST and DISCONNECT_REQUEST", () => {
    for (const service of ["CONNECTIONSTATE_REQUEST", "DISCONNECT_REQUEST"] as const) {
      const bytes = theirs({
        service_type: SERVICE_TYPES[service],
        connstate: { channel_id: 0x15, state: 0 },
        hpai: { protocol_type: 1, tunnel_endpoint: "0.0.0.0:0" },
      });
      expect(decodeKnxNetIpFrame(bytes)).toEqual({
        ok: true,
        value: {
          service,
          channelId: 0x15,
          controlEndpoint: { protocol: "udp", address: "0.0.0.0", port: 0 },
        },
      });
    }
  });

  it("TUNNELLING_REQUEST with an L_Data.req group write, decoded by the engine's cEMI code", () => {
    const bytes = theirs({
      service_type: SERVICE_TYPES.TUNNELLING_REQUEST,
      tunnstate: { channel_id: 0x15, seqnum: 7, rsvd: 0 },
      cemi: cemiTemplate,
    });
    const frame = decodeKnxNetIpFrame(bytes);
    if (!frame.ok || frame.value.service !== "TUNNELLING_REQUEST") throw new Error("decode");
    expect([frame.value.channelId, frame.value.sequenceCounter]).toEqual([0x15, 7]);
    const cemi = decodeCemi(frame.value.cemi);
    if (!cemi.ok) throw new Error(cemi.error.message);
    expect(cemi.value.messageCode).toBe("L_Data.req");
    expect(cemi.value.ackRequest).toBe(true);
    expect(cemi.value.frame).toMatchObject({
      source: 0x11f1,
      destination: 0x1002,
      service: "GroupValue_Write",
      priority: "low",
      hopCount: 6,
      payload: Uint8Array.of(0x0c, 0x1a),
      shortPayload: false,
    });
  });

  it("TUNNELLING_ACK", () => {
    const bytes = theirs({
      service_type: SERVICE_TYPES.TUNNELLING_ACK,
      tunnstate: { channel_id: 0x15, seqnum: 200, rsvd: 0 },
    });
    expect(decodeKnxNetIpFrame(bytes)).toEqual({
      ok: true,
      value: { service: "TUNNELLING_ACK", channelId: 0x15, sequenceCounter: 200, status: 0 },
    });
  });
});

describe("cross-check with the knx package: what Benchline writes, the client reads", () => {
  it("CONNECT_RESPONSE: channel, status, data endpoint, CRD", () => {
    const read = readByThem(
      encodeKnxNetIpFrame({
        service: "CONNECT_RESPONSE",
        channelId: 0x15,
        status: 0,
        granted: {
          dataEndpoint: { protocol: "udp", address: "127.0.0.1", port: 3671 },
          crd: tunnelCrd(0x11f1),
        },
      }),
    );
    expect(read["connstate"]).toEqual({ channel_id: 0x15, status: 0 });
    expect(read["hpai"]).toMatchObject({ protocol_type: 1, tunnel_endpoint: "127.0.0.1:3671" });
    // The package reads a CRD with its CRI layout: the address lands in knx_layer / unused.
    expect(read["cri"]).toMatchObject({ connection_type: 0x04, knx_layer: 0x11, unused: 0xf1 });
  });

  it("CONNECTIONSTATE_RESPONSE and DISCONNECT_REQUEST", () => {
    expect(
      readByThem(
        encodeKnxNetIpFrame({
          service: "CONNECTIONSTATE_RESPONSE",
          channelId: 9,
          status: STATUS.E_CONNECTION_ID,
        }),
      )["connstate"],
    ).toEqual({ channel_id: 9, status: 0x21 });
    const disconnect = readByThem(
      encodeKnxNetIpFrame({
        service: "DISCONNECT_REQUEST",
        channelId: 9,
        controlEndpoint: { protocol: "udp", address: "127.0.0.1", port: 3671 },
      }),
    );
    expect(disconnect["connstate"]).toEqual({ channel_id: 9, status: 0 });
    expect(disconnect["hpai"]).toMatchObject({ tunnel_endpoint: "127.0.0.1:3671" });
  });

  it("TUNNELLING_REQUEST carrying L_Data.ind and L_Data.con, and TUNNELLING_ACK", () => {
    const frame = {
      priority: "low" as const,
      repeated: false,
      source: 0x1114, // 1.1.20
      destination: 0x1102, // 2/1/2
      addressType: "group" as const,
      hopCount: 6,
      service: "GroupValue_Write" as const,
      payload: Uint8Array.of(0x0c, 0x1a),
      shortPayload: false,
    };
    for (const [messageCode, code] of [
      ["L_Data.ind", 0x29],
      ["L_Data.con", 0x2e],
    ] as const) {
      const read = readByThem(
        encodeKnxNetIpFrame({
          service: "TUNNELLING_REQUEST",
          channelId: 3,
          sequenceCounter: 4,
          cemi: encodeCemi({ messageCode, frame }),
        }),
      );
      expect(read["tunnstate"]).toMatchObject({ channel_id: 3, seqnum: 4 });
      const cemi = read["cemi"] as Record<string, unknown>;
      expect(cemi["msgcode"]).toBe(code);
      expect(cemi["src_addr"]).toBe("1.1.20");
      expect(cemi["dest_addr"]).toBe("2/1/2");
      expect(cemi["apdu"]).toMatchObject({ apci: "GroupValue_Write" });
      expect([...((cemi["apdu"] as { data: Buffer }).data ?? [])]).toEqual([0x0c, 0x1a]);
    }
    expect(
      readByThem(
        encodeKnxNetIpFrame({
          service: "TUNNELLING_ACK",
          channelId: 3,
          sequenceCounter: 4,
          status: 0,
        }),
      )["tunnstate"],
    ).toMatchObject({ channel_id: 3, seqnum: 4 });
  });
});
