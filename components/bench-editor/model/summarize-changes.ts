import type { Bench } from "@/engine";
import { groupAddressKey } from "./group-address-key";

function plural(count: number, noun: string): string {
  return `${count} ${noun}${count === 1 ? "" : "s"}`;
}

/**
 * One line saying what changed between two versions of a bench, for the
 * revision history: "added 2 devices, linked 3 objects, renamed 1 group address".
 * Position-only changes count as "moved".
 */
export function summarizeChanges(before: Bench, after: Bench): string {
  const parts: string[] = [];
  const beforeDevices = new Map(before.devices.map((d) => [d.id, d]));
  const afterDevices = new Map(after.devices.map((d) => [d.id, d]));
  const added = after.devices.filter((d) => !beforeDevices.has(d.id)).length;
  const removed = before.devices.filter((d) => !afterDevices.has(d.id)).length;
  let edited = 0;
  let moved = 0;
  for (const device of after.devices) {
    const old = beforeDevices.get(device.id);
    if (old === undefined) continue;
    const { position: p1, ...rest1 } = old;
    const { position: p2, ...rest2 } = device;
    if (JSON.stringify(rest1) !== JSON.stringify(rest2)) edited++;
    else if (JSON.stringify(p1) !== JSON.stringify(p2)) moved++;
  }
  if (added) parts.push(`added ${plural(added, "device")}`);
  if (removed) parts.push(`removed ${plural(removed, "device")}`);
  if (edited) parts.push(`edited ${plural(edited, "device")}`);

  const key = (g: { address: string }) => groupAddressKey(g.address);
  const beforeAddresses = new Map(before.groupAddresses.map((g) => [key(g), g]));
  const afterAddresses = new Map(after.groupAddresses.map((g) => [key(g), g]));
  const gaAdded = after.groupAddresses.filter((g) => !beforeAddresses.has(key(g))).length;
  const gaRemoved = before.groupAddresses.filter((g) => !afterAddresses.has(key(g))).length;
  let gaEdited = 0;
  for (const g of after.groupAddresses) {
    const old = beforeAddresses.get(key(g));
    if (old === undefined) continue;
    if (old.name !== g.name || old.dpt !== g.dpt) gaEdited++;
    else if (JSON.stringify(old.position) !== JSON.stringify(g.position)) moved++;
  }
  if (gaAdded) parts.push(`added ${plural(gaAdded, "group address")}`);
  if (gaRemoved) parts.push(`removed ${plural(gaRemoved, "group address")}`);
  if (gaEdited) parts.push(`edited ${plural(gaEdited, "group address")}`);

  const linkKey = (l: { device: string; object: number; groupAddress: string }) =>
    `${l.device}#${l.object}@${groupAddressKey(l.groupAddress)}`;
  const beforeLinks = new Set(before.links.map(linkKey));
  const afterLinks = new Set(after.links.map(linkKey));
  const linked = [...afterLinks].filter((k) => !beforeLinks.has(k)).length;
  const unlinked = [...beforeLinks].filter((k) => !afterLinks.has(k)).length;
  if (linked) parts.push(`linked ${plural(linked, "object")}`);
  if (unlinked) parts.push(`unlinked ${plural(unlinked, "object")}`);
  const beforeRooms = new Map((before.rooms ?? []).map((r) => [r.id, JSON.stringify(r)]));
  const afterRooms = new Map((after.rooms ?? []).map((r) => [r.id, JSON.stringify(r)]));
  const roomsAdded = [...afterRooms.keys()].filter((id) => !beforeRooms.has(id)).length;
  const roomsRemoved = [...beforeRooms.keys()].filter((id) => !afterRooms.has(id)).length;
  const roomsEdited = [...afterRooms].filter(
    ([id, text]) => beforeRooms.has(id) && beforeRooms.get(id) !== text,
  ).length;
  if (roomsAdded) parts.push(`added ${plural(roomsAdded, "room")}`);
  if (roomsRemoved) parts.push(`removed ${plural(roomsRemoved, "room")}`);
  if (roomsEdited) parts.push(`edited ${plural(roomsEdited, "room")}`);
  if (JSON.stringify(before.unitLinks) !== JSON.stringify(after.unitLinks))
    parts.push("rewired unit links");
  if (before.name !== after.name || before.description !== after.description)
    parts.push("renamed the bench");
  if (moved) parts.push(`moved ${plural(moved, "node")}`);
  if (parts.length === 0) return "No changes";
  const text = parts.join(", ");
  return text[0]!.toUpperCase() + text.slice(1);
}
