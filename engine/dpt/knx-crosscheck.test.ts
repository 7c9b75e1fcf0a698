/*
 * Cross-check against the `knx` npm package's codec (test-only devDependency; Libraries
 * source in knx-reference.md), over thousands of generated values. Where the two
 * differ, the difference is the package's documented behaviour and is asserted as such:
 *
 * - 9.x encode: the package truncates the mantissa toward zero (frexp, then `>>` and
 *   `%` on a fractional mantissa) and only accepts |M| < 2047 strictly; Benchline rounds
 *   half away from zero at the smallest exponent (dpt9.ts). So where the bytes differ,
 *   the package's value is nearer zero than the input and Benchline's is at least as
 *   close to it, one mantissa step apart.
 * - 9.x decode: identical on every pattern except 0x7FFF, which the package decodes as
 *   670760.96 (the pre-v02.02.01 top) and Benchline as the invalid marker, and patterns
 *   below -273, which the package returns for 9.001 and Benchline refuses.
 * - 9.x range: the package does not refuse values above 670433.28.
 * - 5.001 decode: the package rounds to whole percent; Benchline returns the exact step.
 * - 14.x: identical bytes; the package decodes NaN/infinity patterns, Benchline refuses them.
 * - 17.001: the package takes the wire number 0..63; Benchline's values are scenes 1..64.
 */
// eslint-disable-next-line no-restricted-imports -- test-only: the knx package is CommonJS, so the cross-check needs createRequire
import { createRequire } from "node:module";
import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
import type { DptCodec } from "./dpt-codec";
import { decodeFloat16Raw } from "./dpt9";
import { getDpt } from "./registry";

interface KnxDpt {
  readonly id: string;
}
interface KnxDptLib {
  resolve(id: string): KnxDpt;
  populateAPDU(value: unknown, apdu: { data?: Buffer }, id: string): void;
  fromBuffer(buf: Buffer, dpt: KnxDpt): unknown;
}

let knx: KnxDptLib;

beforeAll(() => {
  const require = createRequire(import.meta.url);
  // The package logs through log-driver at trace level; mute it on the instance it uses.
  const logger = createRequire(require.resolve("knx/package.json"))("log-driver").logger as Record<
    string,
    unknown
  >;
  for (const level of ["error", "warn", "info", "debug", "trace"]) logger[level] = () => undefined;
  knx = require("knx/src/dptlib") as KnxDptLib;
});

function codec(id: string): DptCodec<unknown> {
  const c = getDpt(id);
  if (c === undefined) throw new Error(id);
  return c;
}
function theirBytes(value: unknown, id: string): number[] {
  const apdu: { data?: Buffer } = {};
  knx.populateAPDU(value, apdu, `DPT${id}`);
  return [...(apdu.data as Buffer)];
}
function ourBytes(value: unknown, id: string): number[] {
  const r = codec(id).encode(value);
  if (!r.ok) throw new Error(r.error.message);
  return [...r.value];
}
const raw16 = (b: number[]) => ((b[0] as number) << 8) | (b[1] as number);

describe("cross-check with the knx package: 9.001", () => {
  it("decodes every 2-byte pattern to the same number, apart from the documented cases", () => {
    const dpt = knx.resolve("DPT9.001");
    const offenders: string[] = [];
    for (let raw = 0; raw <= 0xffff; raw++) {
      const bytes = Uint8Array.of(raw >>> 8, raw & 0xff);
      const theirs = knx.fromBuffer(Buffer.from(bytes), dpt) as number;
      const ours = codec("9.001").decode(bytes);
      if (raw === 0x7fff) {
        // Documented: 0x7FFF is invalid data for us, 670760.96 for the package.
        if (theirs !== 670760.96 || !ours.ok || typeof ours.value !== "object")
          offenders.push("0x7FFF");
      } else if (theirs < -273) {
        if (ours.ok) offenders.push(`${raw}: ${theirs} accepted below -273`);
      } else if (!ours.ok || ours.value !== theirs) {
        offenders.push(`0x${raw.toString(16)}: ours ${JSON.stringify(ours)} theirs ${theirs}`);
      }
    }
    expect(offenders).toEqual([]);
  });

  it("encodes thousands of values identically or one step nearer the input", () => {
    const onGrid = fc.integer({ min: -27300, max: 67043328 }).map((n) => n / 100);
    const small = fc.integer({ min: -27300, max: 300000 }).map((n) => n / 100); // room temperatures and the like
    const anyDouble = fc.double({ min: -273, max: 670433.28, noNaN: true });
    let same = 0;
    let differ = 0;
    fc.assert(
      fc.property(fc.oneof(onGrid, small, anyDouble), (v) => {
        const ours = raw16(ourBytes(v, "9.001"));
        const theirs = raw16(theirBytes(v, "9.001"));
        if (ours === theirs) {
          same++;
          return;
        }
        differ++;
        const o = decodeFloat16Raw(ours);
        const t = decodeFloat16Raw(theirs);
        const step = 0.01 * 2 ** ((ours >>> 11) & 0x0f);
        const eps = 1e-9 * Math.max(1, Math.abs(v));
        expect(Math.abs(t)).toBeLessThanOrEqual(Math.abs(v) + eps); // theirs truncates toward zero
        expect(Math.abs(o - v)).toBeLessThanOrEqual(Math.abs(t - v) + eps); // ours is at least as close
        expect(Math.abs(o - t)).toBeLessThanOrEqual(step + eps); // one mantissa step apart
      }),
      { numRuns: 6000 },
    );
    expect(same + differ).toBe(6000);
    expect(same).toBeGreaterThan(differ); // most values agree exactly
    // The worked values agree byte for byte (DPT spec §3.10).
    for (const v of [21, 0, -30, 0.01, -0.01, 20.48])
      expect(ourBytes(v, "9.001")).toEqual(theirBytes(v, "9.001"));
  });
});

describe("cross-check with the knx package: 5.001", () => {
  it("encodes thousands of percentages to the same octet", () => {
    fc.assert(
      fc.property(
        fc.oneof(fc.integer({ min: 0, max: 100 }), fc.double({ min: 0, max: 100, noNaN: true })),
        (v) => {
          expect(ourBytes(v, "5.001")).toEqual(theirBytes(v, "5.001"));
        },
      ),
      { numRuns: 5000 },
    );
  });

  it("decodes every octet to the same percentage once ours is rounded to whole percent", () => {
    const dpt = knx.resolve("DPT5.001");
    for (let octet = 0; octet < 256; octet++) {
      const ours = codec("5.001").decode(Uint8Array.of(octet));
      // Documented: the package rounds to whole percent; ours keeps the exact step.
      expect(ours.ok && Math.round(ours.value as number)).toBe(
        knx.fromBuffer(Buffer.of(octet), dpt),
      );
    }
  });
});

describe("cross-check with the knx package: 14.x", () => {
  it("encodes and decodes thousands of values identically", () => {
    const dpt = knx.resolve("DPT14.068");
    fc.assert(
      fc.property(
        fc.oneof(
          fc.double({ min: -3.4e38, max: 3.4e38, noNaN: true }),
          fc.float({ noNaN: true, noDefaultInfinity: true }),
        ),
        (v) => {
          const ours = ourBytes(v, "14.068");
          expect(ours).toEqual(theirBytes(v, "14.068"));
          const back = codec("14.068").decode(Uint8Array.from(ours));
          expect(back.ok && back.value).toBe(knx.fromBuffer(Buffer.from(ours), dpt));
        },
      ),
      { numRuns: 5000 },
    );
  });

  it("decodes any 4-byte pattern the same, except non-finite ones which we refuse", () => {
    const dpt = knx.resolve("DPT14.068");
    fc.assert(
      fc.property(fc.uint8Array({ minLength: 4, maxLength: 4 }), (bytes) => {
        const theirs = knx.fromBuffer(Buffer.from(bytes), dpt) as number;
        const ours = codec("14.068").decode(bytes);
        if (Number.isFinite(theirs)) expect(ours).toEqual({ ok: true, value: theirs });
        else expect(ours).toMatchObject({ ok: false, error: { kind: "dpt.out-of-range" } });
      }),
      { numRuns: 5000 },
    );
  });
});

describe("cross-check with the knx package: 17.001", () => {
  it("puts scene n on the wire as the package's n - 1, for every scene", () => {
    const dpt = knx.resolve("DPT17.001");
    for (let scene = 1; scene <= 64; scene++) {
      // Documented: the package's value is the wire number 0..63.
      expect(ourBytes(scene, "17.001")).toEqual(theirBytes(scene - 1, "17.001"));
      const ours = codec("17.001").decode(Uint8Array.of(scene - 1));
      expect(ours).toEqual({
        ok: true,
        value: (knx.fromBuffer(Buffer.of(scene - 1), dpt) as number) + 1,
      });
    }
  });
});
