import type { Bench, BenchDevice, BenchLink, BenchUnitLink } from "@/engine";
import { getDeviceType } from "@/engine";
import { freshDeviceId } from "./devices";
import { groupAddressKey } from "./group-address-key";
import {
  lineOfIndividualAddress,
  nextIndividualAddress,
  takenIndividualAddresses,
} from "./individual-addresses";
import { parseIndividualAddress } from "@/engine";

/** Devices copied from a bench, with the links and unit links among them. */
export interface DeviceClipboard {
  readonly devices: readonly BenchDevice[];
  readonly links: readonly BenchLink[];
  readonly unitLinks: readonly BenchUnitLink[];
}

export function copyDevices(bench: Bench, ids: readonly string[]): DeviceClipboard {
  const chosen = new Set(ids);
  return {
    devices: bench.devices.filter((d) => chosen.has(d.id)),
    links: bench.links.filter((l) => chosen.has(l.device)),
    unitLinks: bench.unitLinks
      .map((u) => ({ ...u, members: u.members.filter((m) => chosen.has(m)) }))
      .filter((u) => u.members.length >= 2),
  };
}

/**
 * Pastes copies with fresh ids, names marked "(copy)", the next free individual
 * addresses on their lines, positions shifted by `offset`. Links to group
 * addresses that still exist are kept (sending address first, as copied); unit
 * links among the copies are re-made among the copies.
 */
export function pasteDevices(
  bench: Bench,
  clipboard: DeviceClipboard,
  offset = { x: 40, y: 40 },
): { bench: Bench; deviceIds: string[] } {
  const ids = new Set(bench.devices.map((d) => d.id));
  const taken = takenIndividualAddresses(bench);
  const renamed = new Map<string, string>();
  const devices: BenchDevice[] = [];
  for (const source of clipboard.devices) {
    const id = freshDeviceId(bench, source.type, ids);
    ids.add(id);
    renamed.set(source.id, id);
    const copy: BenchDevice = structuredClone({ ...source, id, name: `${source.name} (copy)` });
    if (source.position !== undefined)
      copy.position = { x: source.position.x + offset.x, y: source.position.y + offset.y };
    if (getDeviceType(source.type)?.medium === "knx" && source.individualAddress !== undefined) {
      const raw = parseIndividualAddress(source.individualAddress);
      const line =
        (raw.ok ? lineOfIndividualAddress(bench, raw.value) : undefined) ??
        bench.lines.find((l) => l.id === source.line) ??
        bench.lines[0]!;
      const address = nextIndividualAddress(bench, line, taken);
      if (address === undefined) delete copy.individualAddress;
      else {
        copy.individualAddress = address;
        copy.line = line.id;
        const placed = parseIndividualAddress(address);
        if (placed.ok) taken.add(placed.value);
      }
    }
    devices.push(copy);
  }
  const known = new Set(bench.groupAddresses.map((g) => groupAddressKey(g.address)));
  const links = clipboard.links
    .filter((l) => known.has(groupAddressKey(l.groupAddress)))
    .map((l) => ({ ...l, device: renamed.get(l.device)! }));
  const unitLinkIds = new Set(bench.unitLinks.map((u) => u.id));
  const unitLinks = clipboard.unitLinks.map((u) => {
    let n = 1;
    while (unitLinkIds.has(`unit-link-${n}`)) n++;
    const id = `unit-link-${n}`;
    unitLinkIds.add(id);
    return { ...u, id, members: u.members.map((m) => renamed.get(m)!) };
  });
  return {
    bench: {
      ...bench,
      devices: [...bench.devices, ...devices],
      links: [...bench.links, ...links],
      unitLinks: [...bench.unitLinks, ...unitLinks],
    },
    deviceIds: devices.map((d) => d.id),
  };
}
