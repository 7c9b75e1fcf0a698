/*
 * The paced adapter of today's Simulation, on a fake wall clock: frames from a
 * tunnel take the TP1 line's real timing (knx-reference.md, TP1 timing: a 9-octet
 * telegram with its acknowledgement holds 193 bit times; an unacknowledged one is
 * repeated up to 3 times).
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { encodeCemi } from "@/engine";
import {
  encodeKnxNetIpFrame,
  initialTunnellingServerState,
  ROUTE_BACK_HPAI,
  tunnelCri,
  tunnellingServerConfig,
  tunnellingServerTransition,
  type TunnellingServerState,
} from "@/engine";
import { dataFrameArbitrary } from "@/test/harness/frame-fixtures";
import { bitTimesToUs, frameDurationUs, type DataFrame } from "@/engine";
import { createSimulation } from "@/engine";
import { benchBuilder } from "@/test/harness/bench-builder";
import { fakeWallClock } from "@/test/harness/fake-wall-clock";
import { pacedSimulationLine } from "./simulation-line";

function lightBench() {
  const b = benchBuilder();
  b.groupAddress("1/0/1", "1.001");
  b.groupAddress("1/0/9", "1.001");
  b.device("act", "switch-actuator", "1.1.2", { channels: 1, statusObjects: false });
  b.link("act", 0, "1/0/1");
  return b.build();
}

const write = (destination: number): DataFrame => ({
  priority: "low",
  repeated: false,
  source: 0x11f1, // 1.1.241, a tunnel
  destination,
  addressType: "group",
  hopCount: 6,
  service: "GroupValue_Write",
  payload: Uint8Array.of(1),
  shortPayload: true,
});

describe("pacedSimulationLine", () => {
  it("puts a tunnel's frame on the line at real time and confirms it after the acknowledgement", () => {
    const sim = createSimulation(lightBench(), { seed: 1, traceCapacity: 100 });
    const fake = fakeWallClock();
    const paced = pacedSimulationLine(sim, { clock: fake.clock });
    const seen: DataFrame[] = [];
    const done: boolean[] = [];
    paced.line.subscribe((frame) => seen.push(frame));
    paced.start();
    fake.advance(100); // let the bench's own start-up quieten
    seen.length = 0;
    paced.line.put(write(0x0801), (acknowledged) => done.push(acknowledged));
    // The line has been idle for more than 50 bit times, so the frame starts at once:
    // 9 octets x 13 bit times, then gap 15 + acknowledgement 11 (knx-reference.md).
    const frameEndMs = frameDurationUs(9) / 1000;
    fake.advance(Math.floor(frameEndMs) - 1);
    expect(seen).toEqual([]);
    fake.advance(2);
    expect(seen).toMatchObject([{ source: 0x11f1, destination: 0x0801 }]);
    expect(done).toEqual([]);
    fake.advance(bitTimesToUs(26) / 1000 + 1);
    expect(done).toEqual([true]);
    expect(sim.deviceState("act")).toEqual({ on: [true] });
    paced.stop();
  });

  it("confirms negatively when nobody acknowledges, after the repetitions", () => {
    const sim = createSimulation(lightBench(), { seed: 1, traceCapacity: 100 });
    const fake = fakeWallClock();
    const paced = pacedSimulationLine(sim, { clock: fake.clock });
    const done: boolean[] = [];
    paced.start();
    paced.line.put(write(0x0809), (a) => done.push(a)); // 1/0/9: no listener
    fake.advance(50);
    expect(done).toEqual([]); // still repeating
    fake.advance(200);
    expect(done).toEqual([false]);
    expect(
      sim.trace.filter((e) => e.kind === "telegram.sent" && e.destination === 0x0809),
    ).toHaveLength(4);
    paced.stop();
  });
  it("puts individually addressed frames on the line: the addressed device acknowledges, an absent one does not", () => {
    const sim = createSimulation(lightBench(), { seed: 1, traceCapacity: 100 });
    const fake = fakeWallClock();
    const paced = pacedSimulationLine(sim, { clock: fake.clock });
    const toDevice: boolean[] = [];
    const toNobody: boolean[] = [];
    paced.start();
    paced.line.put({ ...write(0x1102), addressType: "individual" }, (a) => toDevice.push(a)); // 1.1.2, the actuator
    paced.line.put({ ...write(0x1105), addressType: "individual" }, (a) => toNobody.push(a)); // 1.1.5, nobody
    fake.advance(500);
    expect(toDevice).toEqual([true]);
    expect(toNobody).toEqual([false]);
    paced.stop();
  });
});

describe("tunnelling server on the paced line", () => {
  it("every L_Data.req a client can send, mangled or not, is put on the line or refused without throwing", () => {
    const sim = createSimulation(lightBench(), { seed: 1, traceCapacity: 100 });
    const fake = fakeWallClock();
    const paced = pacedSimulationLine(sim, { clock: fake.clock });
    paced.start();
    const config = tunnellingServerConfig({
      endpoint: { address: "127.0.0.1", port: 3671 },
      individualAddress: 0x11f0,
      tunnelAddresses: [0x11f1],
      rateLimit: { perSecond: 1e9, burst: 1e9 },
      maxPendingPerTunnel: 1e6,
    });
    const client = { address: "127.0.0.1", port: 50000 };
    let state: TunnellingServerState = initialTunnellingServerState();
    const connect = tunnellingServerTransition(config, state, {
      kind: "datagram",
      nowUs: 0,
      from: client,
      bytes: encodeKnxNetIpFrame({
        service: "CONNECT_REQUEST",
        controlEndpoint: ROUTE_BACK_HPAI,
        dataEndpoint: ROUTE_BACK_HPAI,
        cri: tunnelCri(),
      }),
    });
    state = connect.state;
    let sequence = 0;
    let puts = 0;
    fc.assert(
      fc.property(
        dataFrameArbitrary,
        fc.nat(),
        fc.nat(255),
        fc.boolean(),
        (frame, at, value, mangle) => {
          const cemi = encodeCemi({ messageCode: "L_Data.req", frame });
          if (mangle && at % cemi.length !== 0) cemi[at % cemi.length] = value;
          const result = tunnellingServerTransition(config, state, {
            kind: "datagram",
            nowUs: 0,
            from: client,
            bytes: encodeKnxNetIpFrame({
              service: "TUNNELLING_REQUEST",
              channelId: 1,
              sequenceCounter: sequence++ & 0xff,
              cemi,
            }),
          });
          state = result.state;
          for (const effect of result.effects)
            if (effect.kind === "line.put") {
              puts++;
              paced.line.put(effect.frame, () => undefined);
            }
          fake.advance(1);
        },
      ),
      { numRuns: 300 },
    );
    expect(puts).toBeGreaterThan(0);
    paced.stop();
  });
});
