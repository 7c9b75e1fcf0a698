/** fast-check arbitraries of KNXnet/IP values, shared by the frame and server properties. */
import fc from "fast-check";
import type { Dib } from "../../engine";
import type { Hpai } from "../../engine";
import type { KnxNetIpFrame } from "../../engine";

const hpaiArbitrary: fc.Arbitrary<Hpai> = fc.record({
  protocol: fc.constantFrom("udp" as const, "tcp" as const),
  address: fc.tuple(fc.nat(255), fc.nat(255), fc.nat(255), fc.nat(255)).map((o) => o.join(".")),
  port: fc.nat(0xffff),
});
const octetArb = fc.nat(255);
const infoArbitrary = fc.record({
  connectionType: octetArb,
  data: fc.uint8Array({ maxLength: 20 }),
});
const dibArbitrary: fc.Arbitrary<Dib> = fc.oneof(
  fc.record({
    kind: fc.constant("device-info" as const),
    medium: octetArb,
    deviceStatus: octetArb,
    individualAddress: fc.nat(0xffff),
    projectInstallationId: fc.nat(0xffff),
    serialNumber: fc.uint8Array({ minLength: 6, maxLength: 6 }),
    multicastAddress: fc
      .tuple(fc.nat(255), fc.nat(255), fc.nat(255), fc.nat(255))
      .map((o) => o.join(".")),
    macAddress: fc.uint8Array({ minLength: 6, maxLength: 6 }),
    friendlyName: fc
      .array(fc.integer({ min: 1, max: 255 }), { maxLength: 30 })
      .map((codes) => String.fromCharCode(...codes)),
  }),
  fc.record({
    kind: fc.constant("service-families" as const),
    families: fc.array(fc.record({ id: octetArb, version: octetArb }), { maxLength: 8 }),
  }),
  fc.record({
    kind: fc.constant("other" as const),
    type: octetArb.filter((t) => t !== 0x01 && t !== 0x02),
    data: fc.uint8Array({ maxLength: 30 }),
  }),
);

export const knxNetIpFrameArbitrary: fc.Arbitrary<KnxNetIpFrame> = fc.oneof(
  fc.record({ service: fc.constant("SEARCH_REQUEST" as const), discoveryEndpoint: hpaiArbitrary }),
  fc.record({
    service: fc.constant("SEARCH_RESPONSE" as const),
    controlEndpoint: hpaiArbitrary,
    dibs: fc.array(dibArbitrary, { maxLength: 3 }),
  }),
  fc.record({
    service: fc.constant("DESCRIPTION_REQUEST" as const),
    controlEndpoint: hpaiArbitrary,
  }),
  fc.record({
    service: fc.constant("DESCRIPTION_RESPONSE" as const),
    dibs: fc.array(dibArbitrary, { maxLength: 3 }),
  }),
  fc.record({
    service: fc.constant("CONNECT_REQUEST" as const),
    controlEndpoint: hpaiArbitrary,
    dataEndpoint: hpaiArbitrary,
    cri: infoArbitrary,
  }),
  fc.oneof(
    fc.record({
      service: fc.constant("CONNECT_RESPONSE" as const),
      channelId: octetArb,
      status: octetArb,
    }),
    fc.record({
      service: fc.constant("CONNECT_RESPONSE" as const),
      channelId: octetArb,
      status: octetArb,
      granted: fc.record({ dataEndpoint: hpaiArbitrary, crd: infoArbitrary }),
    }),
  ),
  fc.record({
    service: fc.constantFrom("CONNECTIONSTATE_REQUEST" as const, "DISCONNECT_REQUEST" as const),
    channelId: octetArb,
    controlEndpoint: hpaiArbitrary,
  }),
  fc.record({
    service: fc.constantFrom("CONNECTIONSTATE_RESPONSE" as const, "DISCONNECT_RESPONSE" as const),
    channelId: octetArb,
    status: octetArb,
  }),
  fc.record({
    service: fc.constant("TUNNELLING_REQUEST" as const),
    channelId: octetArb,
    sequenceCounter: octetArb,
    cemi: fc.uint8Array({ minLength: 1, maxLength: 40 }),
  }),
  fc.record({
    service: fc.constant("TUNNELLING_ACK" as const),
    channelId: octetArb,
    sequenceCounter: octetArb,
    status: octetArb,
  }),
);
