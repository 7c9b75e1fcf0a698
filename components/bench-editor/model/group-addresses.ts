import { formatGroupAddress, parseGroupAddress } from "@/engine";
import { ok } from "@/engine";
import type { Bench, BenchGroupAddress, Position } from "@/engine";
import { dptSizeBits } from "@/engine";
import { deviceObjects } from "./device-objects";
import { refuse, type EditResult } from "./edit-refusal";
import { groupAddressKey, sameGroupAddress } from "./group-address-key";

export interface AddGroupAddressInput {
  /** "1/0/1"; when absent, the next free address after the highest one in `near` (or on the bench). */
  readonly address?: string;
  /** Main/middle group to allocate in when no address is given, e.g. "1/0". */
  readonly near?: string;
  readonly name: string;
  readonly dpt: string;
  readonly position?: Position;
}

/** The lowest free three-level address in main/middle at or after `from`, or undefined. */
export function nextFreeGroupAddress(
  bench: Bench,
  main: number,
  middle: number,
): string | undefined {
  const taken = new Set(bench.groupAddresses.map((g) => groupAddressKey(g.address)));
  for (let sub = 1; sub <= 255; sub++) {
    const raw = (main << 11) | (middle << 8) | sub;
    if (!taken.has(String(raw))) return formatGroupAddress(raw);
  }
  return undefined;
}

function defaultGroup(bench: Bench, near: string | undefined): [number, number] {
  if (near !== undefined) {
    const [main = 1, middle = 0] = near.split("/").map(Number);
    return [main, middle];
  }
  let highest = 0;
  for (const g of bench.groupAddresses) {
    const raw = parseGroupAddress(g.address);
    if (raw.ok && raw.value > highest) highest = raw.value;
  }
  return highest === 0 ? [1, 0] : [highest >>> 11, (highest >>> 8) & 7];
}

function checkAddress(bench: Bench, text: string, except?: string): EditResult<string> {
  const raw = parseGroupAddress(text);
  if (!raw.ok) return refuse("edit.address-invalid", raw.error.message, "address");
  const clash = bench.groupAddresses.find(
    (g) =>
      groupAddressKey(g.address) === String(raw.value) &&
      (except === undefined || !sameGroupAddress(g.address, except)),
  );
  if (clash !== undefined)
    return refuse(
      "edit.address-taken",
      `group address ${clash.address} is already "${clash.name}"`,
      "address",
    );
  return ok(formatGroupAddress(raw.value));
}

/** Adds a group address (three-level text), allocating the next free one when none is given. */
export function addGroupAddress(
  bench: Bench,
  input: AddGroupAddressInput,
): EditResult<{ bench: Bench; address: string }> {
  if (input.name.trim() === "")
    return refuse("edit.name-empty", "a group address needs a name", "name");
  if (dptSizeBits(input.dpt) === undefined)
    return refuse("edit.dpt-unknown", `DPT "${input.dpt}" is not known`, "dpt");
  let text = input.address;
  if (text === undefined) {
    const [main, middle] = defaultGroup(bench, input.near);
    text = nextFreeGroupAddress(bench, main, middle);
    if (text === undefined)
      return refuse("edit.address-taken", `middle group ${main}/${middle} is full`, "address");
  }
  const checked = checkAddress(bench, text);
  if (!checked.ok) return checked;
  const entry: BenchGroupAddress = {
    address: checked.value,
    name: input.name.trim(),
    dpt: input.dpt,
  };
  if (input.position !== undefined) entry.position = input.position;
  return ok({
    bench: { ...bench, groupAddresses: [...bench.groupAddresses, entry] },
    address: checked.value,
  });
}

function find(bench: Bench, address: string): EditResult<BenchGroupAddress> {
  const entry = bench.groupAddresses.find((g) => sameGroupAddress(g.address, address));
  return entry === undefined
    ? refuse("edit.address-unknown", `no group address ${address} on the bench`, "address")
    : ok(entry);
}

export function renameGroupAddress(bench: Bench, address: string, name: string): EditResult {
  const entry = find(bench, address);
  if (!entry.ok) return entry;
  if (name.trim() === "") return refuse("edit.name-empty", "a group address needs a name", "name");
  return ok({
    ...bench,
    groupAddresses: bench.groupAddresses.map((g) =>
      g === entry.value ? { ...g, name: name.trim() } : g,
    ),
  });
}

/** Gives an address a new number; every link follows it, so no object loses its wiring. */
export function renumberGroupAddress(bench: Bench, address: string, to: string): EditResult {
  const entry = find(bench, address);
  if (!entry.ok) return entry;
  const checked = checkAddress(bench, to, address);
  if (!checked.ok) return checked;
  return ok({
    ...bench,
    groupAddresses: bench.groupAddresses.map((g) =>
      g === entry.value ? { ...g, address: checked.value } : g,
    ),
    links: bench.links.map((l) =>
      sameGroupAddress(l.groupAddress, address) ? { ...l, groupAddress: checked.value } : l,
    ),
  });
}

/** Changes an address's DPT; refused when linked objects carry another size. */
export function setGroupAddressDpt(bench: Bench, address: string, dpt: string): EditResult {
  const entry = find(bench, address);
  if (!entry.ok) return entry;
  const size = dptSizeBits(dpt);
  if (size === undefined) return refuse("edit.dpt-unknown", `DPT "${dpt}" is not known`, "dpt");
  const objectSizeBits = (deviceId: string, object: number) => {
    const device = bench.devices.find((d) => d.id === deviceId);
    return device === undefined
      ? undefined
      : deviceObjects(device).find((o) => o.number === object)?.sizeBits;
  };
  const clash = bench.links.find(
    (l) => sameGroupAddress(l.groupAddress, address) && objectSizeBits(l.device, l.object) !== size,
  );
  if (clash !== undefined) {
    return refuse(
      "edit.size-mismatch",
      `${address} has object ${clash.object} of "${clash.device}" linked, which is not ${size} bit; unlink it first`,
      "dpt",
    );
  }
  return ok({
    ...bench,
    groupAddresses: bench.groupAddresses.map((g) => (g === entry.value ? { ...g, dpt } : g)),
  });
}

/** Deletes addresses and every link to them. */
export function deleteGroupAddresses(bench: Bench, addresses: readonly string[]): Bench {
  const gone = new Set(addresses.map(groupAddressKey));
  return {
    ...bench,
    groupAddresses: bench.groupAddresses.filter((g) => !gone.has(groupAddressKey(g.address))),
    links: bench.links.filter((l) => !gone.has(groupAddressKey(l.groupAddress))),
  };
}
