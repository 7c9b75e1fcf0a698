import { getDpt, type DptCodec } from "../dpt";
import type { BenchCheckRule } from "./bench-check-rule";
import type { AddressMember } from "./bench-view";
import type { CheckFinding } from "./check-finding";
import { describeAddress, describeMember } from "./describe-member";

/**
 * Values a sender of this DPT typically sends, to show what each becomes at a
 * receiver of another DPT. Enumerations and 1-bit DPTs are listed whole (every
 * code the codec accepts); scaled and float DPTs get a few everyday values
 * (common practice, no published source: the fan levels, percentages and
 * temperatures an HVAC bench uses).
 */
const EVERYDAY_VALUES: Readonly<Record<string, readonly number[]>> = {
  "5.001": [25, 50, 100],
  "5.004": [50, 100],
  "5.010": [1, 2, 3],
  "5.100": [1, 2, 3],
  "6.001": [-10, 10],
  "6.010": [-2, 1],
  "9.001": [21],
  "9.002": [-1.5, 2],
};

/** A small domain is listed whole; 20.105's 19 codes still read in one message. */
const WHOLE_DOMAIN_LIMIT = 32;

export function meaningSamples(codec: DptCodec<unknown>): unknown[] {
  if (codec.sizeBits === 1) return [false, true];
  const everyday = EVERYDAY_VALUES[codec.id];
  if (everyday !== undefined) return [...everyday];
  if (
    codec.min !== undefined &&
    codec.max !== undefined &&
    codec.max - codec.min <= WHOLE_DOMAIN_LIMIT
  ) {
    const values: number[] = [];
    for (let v = codec.min; v <= codec.max; v += 1) if (codec.encode(v).ok) values.push(v);
    return values;
  }
  return [];
}

/** "Economy (3)" for a code, "On" for a boolean, "50 %" for a number with a unit. */
function describeSent(codec: DptCodec<unknown>, value: unknown): string {
  const text = codec.format(value);
  return typeof value === "number" && text !== String(value) && codec.unit === ""
    ? `${text} (${value})`
    : text;
}

/**
 * What each sample value of `sender` turns into when `receiver` decodes the
 * same payload: "Economy (3) will arrive as Cool". Values whose text is the
 * same on both sides are left out; they are not the surprise.
 */
export function explainMeaningChange(
  sender: DptCodec<unknown>,
  receiver: DptCodec<unknown>,
): string[] {
  const effects: string[] = [];
  for (const value of meaningSamples(sender)) {
    const payload = sender.encode(value);
    if (!payload.ok) continue;
    const sent = describeSent(sender, value);
    const decoded = receiver.decode(payload.value);
    if (!decoded.ok) {
      effects.push(`${sent} will be refused (${decoded.error.message})`);
      continue;
    }
    const arrived = receiver.format(decoded.value);
    if (arrived !== sender.format(value)) effects.push(`${sent} will arrive as ${arrived}`);
  }
  return effects;
}

const sends = (m: AddressMember) =>
  m.sending && m.spec !== undefined && m.spec.flags.communication && m.spec.flags.transmit;
const listens = (m: AddressMember) =>
  m.spec !== undefined && m.spec.flags.communication && (m.spec.flags.write || m.spec.flags.update);

function oneBitSeverity(from: string, to: string): CheckFinding["severity"] | undefined {
  if (getDpt(from)?.sizeBits !== 1) return undefined;
  return from === "1.100" || to === "1.100" ? "warning" : "info";
}

/**
 * Objects of one size but different DPTs on one address understand the same
 * bits differently: the payload is decoded with the receiver's DPT (DPT spec
 * §1.3.1; value tables in §4 for 20.102 and 20.105, §3.5 for 5.001, §3.1 for
 * 1.x, §3.10 for 9.x). Sizes that differ are address.mixed-sizes.
 * Grading: between wider DPTs the value changes meaning or scale (a mode code
 * becomes another mode), an error. Between 1-bit DPTs the swap is usually
 * wanted (occupancy switching a light) and is info, except into or out of
 * 1.100 heat/cool, whose 0 means cooling (§4.2), a polarity that catches
 * people out: a warning.
 */
export const addressDptMeaningRule: BenchCheckRule = {
  id: "address.dpt-meaning",
  severity: "error",
  title: "Objects of one size but different meaning share a group address",
  check(view) {
    const findings: CheckFinding[] = [];
    for (const address of view.addresses.values()) {
      const reported = new Set<string>();
      for (const sender of address.members.filter(sends)) {
        const from = getDpt(sender.spec!.dpt);
        if (from === undefined) continue;
        for (const listener of address.members.filter(listens)) {
          if (listener.device === sender.device && listener.object === sender.object) continue;
          const to = getDpt(listener.spec!.dpt);
          if (to === undefined || to.id === from.id || to.sizeBits !== from.sizeBits) continue;
          const pair = `${from.id}>${to.id}`;
          if (reported.has(pair)) continue;
          reported.add(pair);
          const effects = explainMeaningChange(from, to);
          const effect =
            effects.length > 0
              ? effects.join("; ")
              : `values keep their number but change meaning (${from.name} read as ${to.name})`;
          findings.push({
            rule: this.id,
            severity: oneBitSeverity(from.id, to.id) ?? this.severity,
            message: `${describeAddress(address.text, address.name)}: ${describeMember(view, sender)} sends DPT ${from.id} ${from.name}, but ${describeMember(view, listener)} reads DPT ${to.id} ${to.name}: ${effect}`,
            location: {
              groupAddress: address.text,
              device: listener.device,
              object: listener.object,
            },
          });
        }
      }
    }
    return findings;
  },
};
