import type { LoadedBench } from "../bench";
import { err, ok, type Result } from "../core/result";

/**
 * Individual addresses for a KNXnet/IP endpoint on one bench line: its own
 * address and one per tunnel, all on that line and none already taken by a
 * device or the test tool. Our own choice (no published rule): device numbers
 * from 240 upward, then downward from 239 when those run out, as interfaces are
 * commonly given the top of a line (common practice, no published source).
 */
export interface TunnelAddressPool {
  readonly individualAddress: number;
  readonly tunnelAddresses: readonly number[];
}

/** Why no pool could be made: the line is unknown, or too few addresses are free. */
export interface TunnelAddressPoolError {
  readonly kind: "knxnetip.line-unknown" | "knxnetip.addresses-exhausted";
  readonly field: "lineId" | "tunnels";
  readonly message: string;
}

export function tunnelAddressPool(
  bench: LoadedBench,
  lineId: string,
  tunnels: number,
): Result<TunnelAddressPool, TunnelAddressPoolError> {
  const line = bench.lines.find((l) => l.id === lineId);
  if (line === undefined)
    return {
      ok: false,
      error: {
        kind: "knxnetip.line-unknown",
        field: "lineId",
        message: `no line "${lineId}" on this bench`,
      },
    };
  const used = new Set<number>([bench.testToolAddress]);
  for (const device of bench.devices)
    if (device.individualAddress !== undefined) used.add(device.individualAddress);
  const free: number[] = [];
  for (const device of [...range(240, 255), ...range(239, 1)]) {
    const address = (line.lineAddress << 8) | device;
    if (!used.has(address)) free.push(address);
    if (free.length === tunnels + 1) break;
  }
  if (!Number.isInteger(tunnels) || tunnels < 1 || free.length < tunnels + 1)
    return err({
      kind: "knxnetip.addresses-exhausted",
      field: "tunnels",
      message: `line "${lineId}" has ${Math.max(0, free.length - 1)} free addresses for tunnels, ${tunnels} asked`,
    });
  return ok({ individualAddress: free[0]!, tunnelAddresses: free.slice(1) });
}

function range(from: number, to: number): number[] {
  const step = from <= to ? 1 : -1;
  const values: number[] = [];
  for (let n = from; n !== to + step; n += step) values.push(n);
  return values;
}
