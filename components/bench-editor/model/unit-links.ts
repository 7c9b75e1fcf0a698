import { ok } from "@/engine";
import type { Bench } from "@/engine";
import { getDeviceType } from "@/engine";
import { refuse, type EditResult } from "./edit-refusal";

/**
 * Device types that take part in a unit link (the HVAC wiring between a
 * gateway, its indoor unit and wall controllers, and the refrigerant-system
 * link between an outdoor unit and its indoor units): every type that sits only
 * on unit links, plus the gateway, which sits on KNX as well.
 */
export function joinsUnitLinks(typeId: string): boolean {
  const type = getDeviceType(typeId);
  return type !== undefined && (type.medium === "unit-link" || type.id === "hvac-gateway");
}

type Device = Bench["devices"][number];
type UnitLink = Bench["unitLinks"][number];

/** A link with an outdoor unit on it is a refrigerant-system link; any other is a controller link. */
function isSystemLink(bench: Bench, link: UnitLink): boolean {
  return link.members.some((m) => bench.devices.find((d) => d.id === m)?.type === "outdoor-unit");
}

function freshLinkId(bench: Bench): string {
  const ids = new Set(bench.unitLinks.map((u) => u.id));
  let n = 1;
  while (ids.has(`unit-link-${n}`)) n++;
  return `unit-link-${n}`;
}

/** Puts `joining` on `link`, or makes a new link of `a` and `b` when there is none. */
function addTo(bench: Bench, link: UnitLink | undefined, joining: string, a: string, b: string) {
  if (link === undefined)
    return ok({
      ...bench,
      unitLinks: [...bench.unitLinks, { id: freshLinkId(bench), members: [a, b] }],
    });
  return ok({
    ...bench,
    unitLinks: bench.unitLinks.map((u) =>
      u === link ? { ...u, members: [...u.members, joining] } : u,
    ),
  });
}

/**
 * Pipes an indoor unit to an outdoor unit: every indoor unit of one outdoor
 * unit shares its refrigerant-system link, which is separate from the unit's
 * controller link, so an indoor unit sits on both (a multi-split system).
 */
function joinSystemLink(bench: Bench, outdoor: Device, indoor: Device): EditResult {
  if (indoor.type !== "indoor-unit")
    return refuse(
      "edit.unit-link-invalid",
      `an outdoor unit is piped to indoor units only, not to ${indoor.name}`,
      "unitLink",
    );
  const systemOf = (id: string) =>
    bench.unitLinks.find((u) => u.members.includes(id) && isSystemLink(bench, u));
  const system = systemOf(outdoor.id);
  const current = systemOf(indoor.id);
  if (current !== undefined && current === system)
    return refuse(
      "edit.unit-link-invalid",
      `${indoor.name} is already on ${outdoor.name}'s refrigerant system`,
      "unitLink",
    );
  if (current !== undefined)
    return refuse(
      "edit.unit-link-invalid",
      `${indoor.name} is already on another outdoor unit's refrigerant system ("${current.id}"); an indoor unit has one outdoor unit`,
      "unitLink",
    );
  return addTo(bench, system, indoor.id, outdoor.id, indoor.id);
}

/**
 * Wires two devices. An outdoor unit and an indoor unit go on the outdoor
 * unit's refrigerant-system link (see joinSystemLink). Controllers and their
 * indoor unit go on a controller link: when one of them is already on one, the
 * other joins it; when both are on different controller links, they are
 * refused (one device is wired to one unit); otherwise a new link is made.
 */
export function joinUnitLink(bench: Bench, a: string, b: string): EditResult {
  if (a === b)
    return refuse("edit.unit-link-invalid", "a device cannot be wired to itself", "unitLink");
  const devices: Device[] = [];
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
    devices.push(device);
  }
  const [da, db] = devices as [Device, Device];
  if (da.type === "outdoor-unit" && db.type === "outdoor-unit")
    return refuse("edit.unit-link-invalid", "two outdoor units are not wired together", "unitLink");
  if (da.type === "outdoor-unit") return joinSystemLink(bench, da, db);
  if (db.type === "outdoor-unit") return joinSystemLink(bench, db, da);
  if (da.type === "indoor-unit" && db.type === "indoor-unit")
    return refuse(
      "edit.unit-link-invalid",
      "indoor units share a system through their outdoor unit: wire each of them to the outdoor unit",
      "unitLink",
    );

  const linkOf = (id: string) =>
    bench.unitLinks.find((u) => u.members.includes(id) && !isSystemLink(bench, u));
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
  return addTo(bench, la ?? lb, la === undefined ? a : b, a, b);
}

/** Takes a device off every unit link it is on; a link left with one member is removed. */
export function leaveUnitLink(bench: Bench, device: string): Bench {
  return {
    ...bench,
    unitLinks: bench.unitLinks
      .map((u) => ({ ...u, members: u.members.filter((m) => m !== device) }))
      .filter((u) => u.members.length >= 2),
  };
}
