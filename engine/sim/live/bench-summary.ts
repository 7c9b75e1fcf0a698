import { formatLineAddress } from "../../topology/line-address";
import { formatGroupAddress, formatIndividualAddress } from "../../address";
import type { LoadedBench } from "../../bench";
import {
  controlPanelButtonId,
  controlPanelType,
  isCommandTile,
  type ControlPanelParameters,
} from "../../devices/control-panel";
import type { BenchSummary } from "./live-protocol";

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
    lines: loaded.lines.map((line) => ({
      id: line.id,
      name: line.name,
      address: formatLineAddress(line.lineAddress),
    })),
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
 * Tiles of every control-panel device on the bench, from the parameters the
 * loader already parsed with the type's schema.
 */
function controlPanelTiles(loaded: LoadedBench): BenchSummary["controlPanelTiles"] {
  const tiles: BenchSummary["controlPanelTiles"] = [];
  for (const device of loaded.devices) {
    if (device.type.id !== controlPanelType.id) continue;
    const parameters = device.parameters as ControlPanelParameters;
    parameters.tiles.forEach((tile, index) => {
      const object = device.objects.find((o) => o.number === index);
      const sending = object?.groupAddresses[0];
      tiles.push({
        deviceId: device.id,
        deviceName: device.name,
        object: index,
        label: tile.label,
        kind: tile.kind,
        dpt: tile.dpt,
        buttonId: isCommandTile(tile) ? controlPanelButtonId(index) : null,
        groupAddress: sending === undefined ? null : formatGroupAddress(sending),
        value: tile.value,
      });
    });
  }
  return tiles;
}
