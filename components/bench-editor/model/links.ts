import { ok } from "@/engine";
import type { Bench, BenchLink } from "@/engine";
import { dptSizeBits } from "@/engine";
import { deviceObjects } from "./device-objects";
import { refuse, type EditResult } from "./edit-refusal";
import { sameGroupAddress } from "./group-address-key";

export interface LinkTarget {
  readonly device: string;
  readonly object: number;
  /** Group address as written on the bench. */
  readonly groupAddress: string;
}

/**
 * Links a device's group object to a group address. The first link of an
 * object is its sending address (bench format). Refused, with a message that
 * names both sides, when the address carries a value of another size than the
 * object: a telegram would be misread on one side (DPT spec: 1.001 is 1 bit,
 * 5.001 one octet, 9.001 two octets).
 */
export function connectObject(bench: Bench, target: LinkTarget): EditResult {
  const device = bench.devices.find((d) => d.id === target.device);
  if (device === undefined)
    return refuse("edit.device-unknown", `no device "${target.device}" on the bench`, "device");
  const object = deviceObjects(device).find((o) => o.number === target.object);
  if (object === undefined)
    return refuse(
      "edit.object-unknown",
      `"${device.name}" has no group object ${target.object}`,
      "object",
    );
  const address = bench.groupAddresses.find((g) =>
    sameGroupAddress(g.address, target.groupAddress),
  );
  if (address === undefined)
    return refuse(
      "edit.address-unknown",
      `no group address ${target.groupAddress} on the bench`,
      "groupAddress",
    );
  const addressBits = dptSizeBits(address.dpt);
  if (addressBits !== object.sizeBits) {
    return refuse(
      "edit.size-mismatch",
      `${address.address} "${address.name}" carries ${address.dpt} (${addressBits ?? "?"} bit); object ${object.number} "${object.name}" of ${device.name} is ${object.dpt} (${object.sizeBits} bit)`,
      "groupAddress",
    );
  }
  if (
    bench.links.some(
      (l) =>
        l.device === target.device &&
        l.object === target.object &&
        sameGroupAddress(l.groupAddress, address.address),
    )
  ) {
    return refuse(
      "edit.link-exists",
      `object ${object.number} "${object.name}" of ${device.name} is already on ${address.address}`,
      "groupAddress",
    );
  }
  const link: BenchLink = {
    device: target.device,
    object: target.object,
    groupAddress: address.address,
  };
  return ok({ ...bench, links: [...bench.links, link] });
}

function isLink(link: BenchLink, target: LinkTarget): boolean {
  return (
    link.device === target.device &&
    link.object === target.object &&
    sameGroupAddress(link.groupAddress, target.groupAddress)
  );
}

/** Removes one link; the object's next link (if any) becomes its sending address. */
export function disconnectObject(bench: Bench, target: LinkTarget): EditResult {
  if (!bench.links.some((l) => isLink(l, target))) {
    return refuse(
      "edit.link-unknown",
      `object ${target.object} of "${target.device}" is not on ${target.groupAddress}`,
      "groupAddress",
    );
  }
  return ok({ ...bench, links: bench.links.filter((l) => !isLink(l, target)) });
}

/** Makes an existing link the object's sending address by moving it before the object's other links. */
export function setSendingAddress(bench: Bench, target: LinkTarget): EditResult {
  const index = bench.links.findIndex((l) => isLink(l, target));
  if (index < 0)
    return refuse(
      "edit.link-unknown",
      `object ${target.object} of "${target.device}" is not on ${target.groupAddress}`,
      "groupAddress",
    );
  const first = bench.links.findIndex(
    (l) => l.device === target.device && l.object === target.object,
  );
  const links = bench.links.slice();
  const [link] = links.splice(index, 1);
  links.splice(first, 0, link!);
  return ok({ ...bench, links });
}

/** Whether a link is its object's sending address (the object's first link). */
export function sendingLinks(bench: Bench): Set<BenchLink> {
  const seen = new Set<string>();
  const sending = new Set<BenchLink>();
  for (const link of bench.links) {
    const key = `${link.device}#${link.object}`;
    if (seen.has(key)) continue;
    seen.add(key);
    sending.add(link);
  }
  return sending;
}
