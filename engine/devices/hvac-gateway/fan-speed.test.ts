import { describe, expect, it } from "vitest";
import { getDpt } from "../../dpt";
import { fanLevelFromKnx, fanStatusToKnx } from "./fan-speed";
import { gatewayFixture } from "./gateway-fixture";
import { gatewayObjects as O } from "./objects";
import { gatewayGroupObjects } from "./objects";
import { hvacGatewayParametersSchema } from "./parameters";

const percent = getDpt("5.001")!;
/** The percentage a 5.001 receiver decodes from a raw octet (DPT spec §3.5: raw · 100 / 255). */
const fromRaw = (raw: number) => {
  const decoded = percent.decode(Uint8Array.of(raw));
  if (!decoded.ok) throw new Error(decoded.error.message);
  return decoded.value as number;
};

// The DPTs are the standard's (DPT spec §3.5 5.001 scaling, §3.6 5.010 counter); the split of
// 0..100 % into levels is common practice, no published source.
describe("fan speed mapping", () => {
  it("splits 0..100 % evenly over 3 levels on the raw octet: 1..85 -> 1, 86..170 -> 2, 171..255 -> 3", () => {
    const levelOfRaw = (raw: number) => fanLevelFromKnx(fromRaw(raw), "percent", 3);
    expect([1, 85, 86, 170, 171, 255].map(levelOfRaw)).toEqual([1, 1, 2, 2, 3, 3]);
    expect(fanLevelFromKnx(0, "percent", 3)).toBe(0);
    // Decoded values a visualisation shows: 33.3 %, 33.7 %, 66.7 %, 67.1 %.
    expect([85, 86, 170, 171].map((raw) => percent.format(fromRaw(raw)))).toEqual([
      "33.3 %",
      "33.7 %",
      "66.7 %",
      "67.1 %",
    ]);
  });

  it("reports level k of n as k · 100 / n %, which reads back as level k for every n", () => {
    for (let n = 2; n <= 5; n++)
      for (let k = 1; k <= n; k++) {
        const status = fanStatusToKnx(k, "percent", n);
        const encoded = percent.encode(status);
        if (!encoded.ok) throw new Error(encoded.error.message);
        expect(fanLevelFromKnx(fromRaw(encoded.value[0]!), "percent", n)).toBe(k);
      }
    expect(fanStatusToKnx(2, "percent", 4)).toBe(50);
  });

  it("the counter (5.010) and the level (5.100) carry the level number itself", () => {
    expect(fanLevelFromKnx(2, "counter", 3)).toBe(2);
    expect(fanStatusToKnx(2, "counter", 3)).toBe(2);
    expect(fanStatusToKnx(0, "level", 3)).toBe(0);
  });
});

describe("fan encodings on the gateway", () => {
  it("declares the fan objects on the DPT of the encoding, 5.100 by default", () => {
    const dptOf = (parameters: Record<string, unknown>) =>
      gatewayGroupObjects(hvacGatewayParametersSchema.parse(parameters)).find(
        (o) => o.number === O.fan,
      )!.dpt;
    expect(dptOf({})).toBe("5.100");
    expect(dptOf({ fanEncoding: "counter" })).toBe("5.010");
    expect(dptOf({ fanEncoding: "percent" })).toBe("5.001");
  });

  it("percentage: 50 % on 3 levels runs level 2 and reports 66.7 %", () => {
    const f = gatewayFixture({ gateway: { fanEncoding: "percent", fanLevels: 3 } });
    f.write(O.fan, 50);
    expect(f.unit().fanLevel).toBe(2);
    expect(f.lastSent(O.fanStatus)).toBeCloseTo(200 / 3, 9);
  });

  it("counter: 5 on 3 levels is clamped to 3 and reported as 3", () => {
    const f = gatewayFixture({ gateway: { fanEncoding: "counter", fanLevels: 3 } });
    f.write(O.fan, 5);
    expect(f.unit().fanLevel).toBe(3);
    expect(f.lastSent(O.fanStatus)).toBe(3);
  });

  it("automatic-fan object: 1 selects automatic, 0 returns to level 1; a fan value of 0 is refused", () => {
    const f = gatewayFixture({ gateway: { fanEncoding: "percent", fanAutoObject: true } });
    f.write(O.fan, 100);
    expect(f.unit().fanLevel).toBe(3);
    f.write(O.fanAuto, true);
    expect(f.unit().fanLevel).toBe(0);
    expect(f.lastSent(O.fanAutoStatus)).toBe(true);
    expect(f.lastSent(O.fanStatus)).toBe(0);
    f.write(O.fanAuto, false);
    expect(f.unit().fanLevel).toBe(1);
    expect(f.lastSent(O.fanAutoStatus)).toBe(false);
    f.write(O.fan, 0);
    expect(f.unit().fanLevel).toBe(1);
    expect(f.harness.transitionNames("gw")).toContain("fan.refused");
  });

  it("level (5.100) keeps 0 as automatic for existing benches", () => {
    const f = gatewayFixture({ gateway: { fanAuto: true } });
    f.write(O.fan, 2);
    f.write(O.fan, 0);
    expect(f.unit().fanLevel).toBe(0);
    expect(f.lastSent(O.fanStatus)).toBe(0);
  });
});
