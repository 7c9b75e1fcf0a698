import { formatIndividualAddress, parseIndividualAddress, parseLineAddress } from "@/engine";
import type { Bench, BenchLine } from "@/engine";

/** The raw individual addresses taken on the bench, the test tool's included. */
export function takenIndividualAddresses(bench: Bench, exceptDevice?: string): Set<number> {
  const taken = new Set<number>();
  const tool = parseIndividualAddress(bench.testToolAddress);
  if (tool.ok) taken.add(tool.value);
  for (const device of bench.devices) {
    if (device.id === exceptDevice || device.individualAddress === undefined) continue;
    const raw = parseIndividualAddress(device.individualAddress);
    if (raw.ok) taken.add(raw.value);
  }
  return taken;
}

/** High byte of the line's individual addresses (area << 4 | line). */
export function lineHighByte(line: BenchLine): number {
  return parseLineAddress(line.address);
}

/**
 * The lowest free device address on the line, starting at 1: device 0 is
 * left to the line's coupler (common practice, no published source). Undefined
 * when the line's 255 device addresses are all used.
 */
export function nextIndividualAddress(
  bench: Bench,
  line: BenchLine,
  taken = takenIndividualAddresses(bench),
): string | undefined {
  const high = lineHighByte(line) << 8;
  for (let device = 1; device <= 255; device++) {
    if (!taken.has(high | device)) return formatIndividualAddress(high | device);
  }
  return undefined;
}

/** The bench line whose address matches the individual address, if any. */
export function lineOfIndividualAddress(bench: Bench, raw: number): BenchLine | undefined {
  return bench.lines.find((line) => lineHighByte(line) === raw >> 8);
}
