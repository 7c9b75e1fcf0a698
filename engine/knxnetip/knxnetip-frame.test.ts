/*
 * KNXnet/IP frames against byte layouts written out from the specification
 * (source key "KNXnet/IP spec" in knx-reference.md: KNX Standard 03_08_02 Core,
 * 03_08_04 Tunnelling, also ISO 22510). Section numbers are from memory; the
 * service codes, CRI and status codes are in knx-reference.md.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { encodeCemi } from "../frame/cemi";
import { fromHex, toHex } from "../frame/hex";
import { parseGroupAddress } from "../address";
import { STATUS, TUNNEL_LAYER } from "./constants";
import { crdIndividualAddress, tunnelCrd, tunnelCri } from "./connection-info";
import type { Dib } from "./dib";
import { knxNetIpFrameArbitrary } from "../../test/harness/knxnetip-fixtures";
import { ROUTE_BACK_HPAI, type Hpai } from "./hpai";
import { decodeKnxNetIpFrame, encodeKnxNetIpFrame, type KnxNetIpFrame } from "./knxnetip-frame";

const loopback: Hpai = { protocol: "udp", address: "127.0.0.1", port: 3671 };
const bytes = (text: string) => fromHex(text)!;

function roundTrip(frame: KnxNetIpFrame, hex: string): void {
  expect(toHex(encodeKnxNetIpFrame(frame))).toBe(hex);
  expect(decodeKnxNetIpFrame(bytes(hex))).toEqual({ ok: true, value: frame });
}

const deviceInfo: Dib = {
  kind: "device-info",
  medium: 0x02,
  deviceStatus: 0,
  individualAddress: 0x11f0, // 1.1.240
  projectInstallationId: 0,
  serialNumber: Uint8Array.of(0x00, 0x00, 0x00, 0x00, 0x00, 0x01),
  multicastAddress: "224.0.23.12",
  macAddress: Uint8Array.of(0, 0, 0, 0, 0, 0),
  friendlyName: "Bench",
};
const families: Dib = {
  kind: "service-families",
  families: [
    { id: 0x02, version: 1 },
    { id: 0x04, version: 1 },
  ],
};
// Core §7.5.4.2 (from memory): 0x36 | 0x01 | medium | status | IA | project id | serial (6)
// | multicast (4) | MAC (6) | friendly name (30, padded with 0x00).
const deviceInfoHex =
  "36 01 02 00 11 F0 00 00 00 00 00 00 00 01 E0 00 17 0C 00 00 00 00 00 00 42 65 6E 63 68" +
  " 00".repeat(25);
// Core §7.5.4.3 (from memory): length | 0x02 | (family, version)…: core 0x02 v1, tunnelling 0x04 v1.
const familiesHex = "06 02 02 01 04 01";

describe("KNXnet/IP frames: byte layouts", () => {
  it("writes the header as 06 10, service type and total length (Core §2.3.1)", () => {
    // knx-reference.md: 6-octet header (0x06, version 0x10, service type, total length).
    roundTrip(
      { service: "CONNECTIONSTATE_RESPONSE", channelId: 0x15, status: STATUS.E_NO_ERROR },
      "06 10 02 08 00 08 15 00",
    );
  });

  it("SEARCH_REQUEST carries the discovery endpoint HPAI (Core §7.6.1)", () => {
    // HPAI: length 8, protocol 0x01 UDP, IPv4, port (knx-reference.md); 3671 = 0x0E57.
    roundTrip(
      { service: "SEARCH_REQUEST", discoveryEndpoint: loopback },
      "06 10 02 01 00 0E 08 01 7F 00 00 01 0E 57",
    );
  });

  it("SEARCH_RESPONSE: control endpoint, device information DIB, service families DIB (Core §7.6.2)", () => {
    const frame: KnxNetIpFrame = {
      service: "SEARCH_RESPONSE",
      controlEndpoint: loopback,
      dibs: [deviceInfo, families],
    };
    // 6 + 8 + 54 + 6 = 74 = 0x4A
    roundTrip(frame, `06 10 02 02 00 4A 08 01 7F 00 00 01 0E 57 ${deviceInfoHex} ${familiesHex}`);
  });

  it("DESCRIPTION_REQUEST / DESCRIPTION_RESPONSE (Core §7.7)", () => {
    roundTrip(
      { service: "DESCRIPTION_REQUEST", controlEndpoint: ROUTE_BACK_HPAI },
      "06 10 02 03 00 0E 08 01 00 00 00 00 00 00",
    );
    roundTrip(
      { service: "DESCRIPTION_RESPONSE", dibs: [deviceInfo, families] },
      `06 10 02 04 00 42 ${deviceInfoHex} ${familiesHex}`,
    );
  });

  it("CONNECT_REQUEST with a link-layer tunnel CRI 04 04 02 00 (Core §7.8.1, Tunnelling §4.4.3)", () => {
    // knx-reference.md: CRI for a tunnel: length 4, TUNNEL_CONNECTION 0x04, link layer 0x02.
    roundTrip(
      {
        service: "CONNECT_REQUEST",
        controlEndpoint: ROUTE_BACK_HPAI,
        dataEndpoint: { protocol: "udp", address: "127.0.0.1", port: 50000 },
        cri: tunnelCri(),
      },
      "06 10 02 05 00 1A 08 01 00 00 00 00 00 00 08 01 7F 00 00 01 C3 50 04 04 02 00",
    );
  });

  it("CONNECT_RESPONSE grants a channel with the data endpoint and a CRD of the tunnel's address (Tunnelling §4.4.4)", () => {
    const frame: KnxNetIpFrame = {
      service: "CONNECT_RESPONSE",
      channelId: 0x15,
      status: STATUS.E_NO_ERROR,
      granted: { dataEndpoint: loopback, crd: tunnelCrd(0x11f1) },
    };
    roundTrip(frame, "06 10 02 06 00 14 15 00 08 01 7F 00 00 01 0E 57 04 04 11 F1");
    expect(crdIndividualAddress(tunnelCrd(0x11f1))).toBe(0x11f1);
    // A refusal carries only channel id and status (knx-reference.md: E_NO_MORE_CONNECTIONS 0x24).
    roundTrip(
      { service: "CONNECT_RESPONSE", channelId: 0, status: STATUS.E_NO_MORE_CONNECTIONS },
      "06 10 02 06 00 08 00 24",
    );
  });

  it("CONNECTIONSTATE and DISCONNECT requests: channel id, reserved 00, control endpoint (Core §7.8.3, §7.8.5)", () => {
    roundTrip(
      { service: "CONNECTIONSTATE_REQUEST", channelId: 0x15, controlEndpoint: ROUTE_BACK_HPAI },
      "06 10 02 07 00 10 15 00 08 01 00 00 00 00 00 00",
    );
    roundTrip(
      { service: "DISCONNECT_REQUEST", channelId: 0x15, controlEndpoint: loopback },
      "06 10 02 09 00 10 15 00 08 01 7F 00 00 01 0E 57",
    );
    roundTrip(
      { service: "DISCONNECT_RESPONSE", channelId: 0x15, status: STATUS.E_CONNECTION_ID },
      "06 10 02 0A 00 08 15 21",
    );
  });

  it("TUNNELLING_REQUEST: connection header 04, channel, sequence, reserved, then the cEMI message (Tunnelling §4.4.6)", () => {
    // cEMI L_Data.req: 1.1.241 writes 21.00 °C (DPT spec §3.10: 0C 1A) to 2/0/2.
    const destination = parseGroupAddress("2/0/2");
    if (!destination.ok) throw new Error("2/0/2");
    const cemi = encodeCemi({
      messageCode: "L_Data.req",
      frame: {
        priority: "low",
        repeated: false,
        source: 0x11f1,
        destination: destination.value,
        addressType: "group",
        hopCount: 6,
        service: "GroupValue_Write",
        payload: Uint8Array.of(0x0c, 0x1a),
        shortPayload: false,
      },
    });
    roundTrip(
      { service: "TUNNELLING_REQUEST", channelId: 0x15, sequenceCounter: 0x07, cemi },
      "06 10 04 20 00 17 04 15 07 00 11 00 BC E0 11 F1 10 02 03 00 80 0C 1A",
    );
  });

  it("TUNNELLING_ACK: connection header with the status in the fourth octet (Tunnelling §4.4.7)", () => {
    roundTrip(
      { service: "TUNNELLING_ACK", channelId: 0x15, sequenceCounter: 0xff, status: 0 },
      "06 10 04 21 00 0A 04 15 FF 00",
    );
  });

  it("accepts the other tunnel layers in a CRI as values; the server decides", () => {
    const frame = decodeKnxNetIpFrame(
      bytes("06 10 02 05 00 1A 08 01 00 00 00 00 00 00 08 01 00 00 00 00 00 00 04 04 80 00"),
    );
    expect(frame.ok && frame.value.service === "CONNECT_REQUEST" && frame.value.cri.data[0]).toBe(
      TUNNEL_LAYER.BUSMONITOR_LAYER,
    );
  });
});

describe("KNXnet/IP frames: refusals are typed errors", () => {
  const cases: [string, string, string][] = [
    ["", "knxnetip.truncated", "empty datagram"],
    ["06 10 02 08 00", "knxnetip.truncated", "header cut short"],
    ["05 10 02 08 00 08 15 00", "knxnetip.header", "header length 5"],
    ["06 20 02 08 00 08 15 00", "knxnetip.header", "protocol version 2.0"],
    ["06 10 02 08 00 09 15 00", "knxnetip.truncated", "total length longer than the datagram"],
    ["06 10 02 08 00 07 15 00", "knxnetip.length", "total length shorter than the datagram"],
    ["06 10 05 30 00 08 15 00", "knxnetip.service", "routing is not implemented here"],
    ["06 10 02 01 00 0E 08 03 7F 00 00 01 0E 57", "knxnetip.structure", "HPAI protocol 0x03"],
    ["06 10 02 01 00 0E 07 01 7F 00 00 01 0E 57", "knxnetip.length", "HPAI length 7"],
    ["06 10 02 01 00 0D 08 01 7F 00 00 01 0E", "knxnetip.truncated", "HPAI cut short"],
    [
      "06 10 02 05 00 1A 08 01 00 00 00 00 00 00 08 01 00 00 00 00 00 00 05 04 02 00",
      "knxnetip.length",
      "CRI length 5 in 4 octets",
    ],
    ["06 10 04 20 00 0A 04 15 00 00", "knxnetip.truncated", "tunnelling request without cEMI"],
    ["06 10 04 21 00 0A 05 15 00 00", "knxnetip.length", "connection header length 5"],
    ["06 10 04 21 00 0B 04 15 00 00 00", "knxnetip.length", "ack with an extra octet"],
    ["06 10 02 04 00 09 36 01 02", "knxnetip.length", "DIB longer than the frame"],
    ["06 10 02 04 00 0B 05 02 02 01 04", "knxnetip.length", "odd service families DIB"],
  ];
  it.each(cases)("%s -> %s (%s)", (hex, kind) => {
    const result = decodeKnxNetIpFrame(bytes(hex));
    expect(result.ok).toBe(false);
    if (!result.ok) {
      expect(result.error.kind).toBe(kind);
      expect(result.error.message.length).toBeGreaterThan(0);
    }
  });
});

describe("KNXnet/IP frames: properties", () => {
  it("every valid frame round-trips through its octets", () => {
    fc.assert(
      fc.property(knxNetIpFrameArbitrary, (frame) => {
        const encoded = encodeKnxNetIpFrame(frame);
        expect(decodeKnxNetIpFrame(encoded)).toEqual({ ok: true, value: frame });
        expect(toHex(encodeKnxNetIpFrame(frame))).toBe(toHex(encoded));
      }),
      { numRuns: 2000 },
    );
  });

  it("no input throws: random octets, and valid frames with octets flipped or cut", () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 120 }), (input) => {
        decodeKnxNetIpFrame(input);
      }),
      { numRuns: 5000 },
    );
    fc.assert(
      fc.property(
        knxNetIpFrameArbitrary,
        fc.nat(),
        fc.nat(255),
        fc.nat(),
        (frame, at, value, cut) => {
          const encoded = encodeKnxNetIpFrame(frame);
          const mutated = encoded.slice();
          mutated[at % mutated.length] = value;
          decodeKnxNetIpFrame(mutated);
          decodeKnxNetIpFrame(encoded.slice(0, cut % (encoded.length + 1)));
        },
      ),
      { numRuns: 3000 },
    );
  });
});
