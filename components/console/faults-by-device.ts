import type { ActiveFault, BenchSummary } from "@/components/sim/sim-protocol";

/**
 * Active fault ids per device: faults on a device (injected or raised by it),
 * and a fault on a unit link (a broken link) on every member of that link.
 */
export function faultsByDevice(
  faults: readonly ActiveFault[],
  bench: Pick<BenchSummary, "devices" | "unitLinks">,
): ReadonlyMap<string, readonly string[]> {
  const byDevice = new Map<string, string[]>();
  const add = (deviceId: string, fault: string) => {
    const list = byDevice.get(deviceId) ?? [];
    if (!list.includes(fault)) list.push(fault);
    byDevice.set(deviceId, list);
  };
  for (const { target, fault } of faults) {
    const link = bench.unitLinks.find((l) => l.id === target);
    if (link !== undefined) for (const member of link.members) add(member, fault);
    else add(target, fault);
  }
  return byDevice;
}
