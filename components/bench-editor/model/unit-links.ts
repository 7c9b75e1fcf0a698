import { ok } from "@/engine";
import type { Bench } from "@/engine";
import { getDeviceType } from "@/engine";
import { refuse, type EditResult } from "./edit-refusal";

/**
 * Device types that take part in a unit link (the HVAC wiring between a
 * gateway, its indoor unit and wall controllers): every type that sits only on
 * a unit link, plus the gateway, which sits on both.
 */
export function joinsUnitLinks(typeId: string): boolean {
  const type = getDeviceType(typeId);
  return type !== undefined && (type.medium === "unit-link" || type.id === "hvac-gateway");
}

/**
 * Wires two devices on one unit link: when one of them is already on a link,
 * the other joins it; when both are on different links, they are refused
 * (one device is wired to one unit); otherwise a new link is made.
 */
export function joinUnitLink(bench: Bench, a: string, b: string): EditResult {
  if (a === b)
    return refuse("edit.unit-link-invalid", "a device cannot be wired to itself", "unitLink");
  for (const id of [a, b]) {
    const device = bench.devices.find((d) => d.id === id);
    if (device === undefined)
      return refuse("edit.device-unknown", `no device "${id}" on the bench`, "device");
    if (!joinsUnitLinks(device.type))
      return refuse(
        "edit.unit-link-invalid",
        `${device.name} has no unit-link connection`,
        "unitLink",
      );
  }
  const linkOf = (id: string) => bench.unitLinks.find((u) => u.members.includes(id));
  const la = linkOf(a);
  const lb = linkOf(b);
  if (la !== undefined && la === lb)
    return refuse("edit.unit-link-invalid", `both are already on unit link "${la.id}"`, "unitLink");
  if (la !== undefined && lb !== undefined) {
    return refuse(
      "edit.unit-link-invalid",
      `the two devices are on different unit links ("${la.id}", "${lb.id}"); remove one first`,
      "unitLink",
    );
  }
  if (la !== undefined || lb !== undefined) {
    const link = (la ?? lb)!;
    const joining = la === undefined ? a : b;
    return ok({
      ...bench,
      unitLinks: bench.unitLinks.map((u) =>
        u === link ? { ...u, members: [...u.members, joining] } : u,
      ),
    });
  }
  const ids = new Set(bench.unitLinks.map((u) => u.id));
  let n = 1;
  while (ids.has(`unit-link-${n}`)) n++;
  return ok({
    ...bench,
    unitLinks: [...bench.unitLinks, { id: `unit-link-${n}`, members: [a, b] }],
  });
}

/** Takes a device off its unit link; a link left with one member is removed. */
export function leaveUnitLink(bench: Bench, device: string): Bench {
  return {
    ...bench,
    unitLinks: bench.unitLinks
      .map((u) => ({ ...u, members: u.members.filter((m) => m !== device) }))
      .filter((u) => u.members.length >= 2),
  };
}
