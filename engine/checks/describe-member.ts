import type { AddressMember, BenchView } from "./bench-view";

/** "Lab lights button (pb-lab) object 0 "Switch 1"" — how findings name an object. */
export function describeObject(view: BenchView, device: string, object: number): string {
  const entry = view.devices.get(device);
  const name = entry ? `${entry.device.name} (${device})` : device;
  const spec = entry?.objects.find((candidate) => candidate.number === object);
  return spec ? `${name} object ${object} "${spec.name}"` : `${name} object ${object}`;
}

export function describeMember(view: BenchView, member: AddressMember): string {
  return describeObject(view, member.device, member.object);
}

/** "1/0/1 "Lab lights"" */
export function describeAddress(text: string, name: string | undefined): string {
  return name ? `${text} "${name}"` : text;
}
