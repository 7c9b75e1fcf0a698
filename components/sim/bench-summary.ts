import { formatGroupAddress, formatIndividualAddress } from "@/engine/address";
import type { LoadedBench } from "@/engine/bench";
import type { BenchSummary } from "./sim-protocol";

/** Device types whose parameters carry a controller role on the unit link. */
const ROLE_TYPES = new Set(["hvac-gateway", "wall-controller"]);

/**
 * What the console needs to know about a bench to draw its controls: addresses
 * with names and DPTs, devices with their objects and local buttons, unit links,
 * and control-panel tiles. Built once in the worker when a bench loads.
 */
export function summarizeBench(loaded: LoadedBench): BenchSummary {
  const bench = loaded.bench;
  return {
    name: bench.name,
    lines: loaded.lines.map((line) => ({ id: line.id, name: line.name })),
    testToolAddress: formatIndividualAddress(loaded.testToolAddress),
    groupAddresses: [...loaded.groupAddresses.values()]
      .map((ga) => ({
        raw: ga.raw,
        address: formatGroupAddress(ga.raw),
        name: ga.name,
        dpt: ga.dpt,
      }))
      .sort((a, b) => a.raw - b.raw),
    devices: loaded.devices.map((device) => {
      const parameters = device.parameters as Record<string, unknown>;
      const role = parameters.role;
      return {
        id: device.id,
        name: device.name,
        type: device.type.id,
        typeLabel: device.type.label,
        medium: device.type.medium,
        individualAddress:
          device.individualAddress === undefined
            ? null
            : formatIndividualAddress(device.individualAddress),
        buttons: device.type.buttons(device.parameters).map((b) => ({ id: b.id, label: b.label })),
        objects: device.objects.map((object) => ({
          number: object.number,
          name: object.spec.name,
          dpt: object.dpt,
          role: object.spec.role,
          groupAddresses: object.groupAddresses.map((raw) => formatGroupAddress(raw)),
        })),
        unitLinks: [...device.unitLinks],
        role:
          ROLE_TYPES.has(device.type.id) && (role === "primary" || role === "secondary")
            ? role
            : null,
      };
    }),
    unitLinks: loaded.unitLinks.map((link) => ({
      id: link.id,
      name: link.name ?? link.id,
      members: [...link.members],
    })),
    controlPanelTiles: controlPanelTiles(loaded),
  };
}

/**
 * Tiles of any control-panel device on the bench. The catalogue has no such
 * type yet, so the parameters are read leniently: `tiles: [{ label,
 * groupAddress, value }]`; anything else is ignored.
 */
function controlPanelTiles(loaded: LoadedBench): BenchSummary["controlPanelTiles"] {
  const tiles: BenchSummary["controlPanelTiles"] = [];
  for (const device of loaded.bench.devices) {
    if (device.type !== "control-panel") continue;
    const list = (device.parameters as { tiles?: unknown }).tiles;
    if (!Array.isArray(list)) continue;
    for (const tile of list as unknown[]) {
      if (typeof tile !== "object" || tile === null) continue;
      const { label, groupAddress, value } = tile as Record<string, unknown>;
      if (typeof label === "string" && typeof groupAddress === "string") {
        tiles.push({ deviceId: device.id, label, groupAddress, value });
      }
    }
  }
  return tiles;
}
