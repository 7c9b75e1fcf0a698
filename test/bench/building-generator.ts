import type { BenchInput } from "../../engine";

/**
 * A generated office building for scale checks: `areas` areas of
 * `linesPerArea` lines each, every area with its main line and area coupler,
 * a backbone, and a line coupler per line. Rooms fill the lines until the
 * building holds about `devices` KNX devices (couplers and central devices
 * included). Deterministic: no randomness, so a benchmark and the canvas see
 * the same building.
 *
 * Per room: a push-button (toggles the room light, follows its status), a
 * switch actuator (light, status), a room temperature sensor (on change and
 * about every 10 min), and in every `hvacEvery`-th room an HVAC gateway with
 * its indoor unit on a unit link, sending its status about every 5 min. Cycle
 * times differ from room to room (540..659 s, 240..359 s): identical cycles
 * started together would send in step and flood the main lines every cycle. Per area a
 * supervision actuator on the main line listens to every light status of the
 * area, and per floor a panel on the main line shows the floor's room
 * temperatures and HVAC status (traffic that crosses the line couplers
 * upward); on the backbone a
 * central push-button sends "building all off" on 15/7/1, which every light
 * listens to (main group 15 passes filtering couplers without a table entry;
 * engine/topology/coupler-rules.ts). Group addresses: lights a/l/4r.., HVAC
 * (a+3)/l/8r.. for area a, line l, room r.
 *
 * Invented building and names, for the demo and benchmarks only.
 */
export interface BuildingOptions {
  /** KNX devices to aim for (default 1,000); the building has this many or a few fewer. */
  readonly devices?: number;
  /** Areas 1..n (default 3, at most 15). */
  readonly areas?: number;
  /** Lines per area (default 4, at most 15). */
  readonly linesPerArea?: number;
  /** One HVAC gateway per this many rooms (default 2). */
  readonly hvacEvery?: number;
  /** Name of the bench (default "Generated office building"). */
  readonly name?: string;
}

type Device = NonNullable<BenchInput["devices"]>[number];
type Link = NonNullable<BenchInput["links"]>[number];
type GroupAddress = NonNullable<BenchInput["groupAddresses"]>[number];

/** The group address every light listens to for "building all off". */
export const BUILDING_ALL_OFF = "15/7/1";

export function generateBuilding(options: BuildingOptions = {}): BenchInput {
  const areas = Math.min(15, options.areas ?? 3);
  const linesPerArea = Math.min(15, options.linesPerArea ?? 4);
  const hvacEvery = Math.max(1, options.hvacEvery ?? 2);
  const target = options.devices ?? 1000;
  const lineCount = areas * linesPerArea;
  // Fixed devices: line couplers and floor panels, area couplers and supervision actuators, the central button.
  const fixed = 2 * lineCount + 2 * areas + 1;
  const perRoom = 3 + 1 / hvacEvery;
  const roomsPerLine = Math.max(
    1,
    Math.min(50, Math.floor((target - fixed) / lineCount / perRoom)),
  );

  const lines: BenchInput["lines"] = [{ id: "backbone", address: "0.0", name: "Backbone" }];
  const groupAddresses: GroupAddress[] = [
    { address: BUILDING_ALL_OFF, name: "Building all off", dpt: "1.001" },
  ];
  const devices: Device[] = [
    {
      id: "central-all-off",
      type: "push-button",
      name: "Reception all-off button",
      individualAddress: "0.0.1",
      parameters: { channels: [{ function: "off" }] },
    },
  ];
  const links: Link[] = [{ device: "central-all-off", object: 0, groupAddress: BUILDING_ALL_OFF }];
  const unitLinks: NonNullable<BenchInput["unitLinks"]> = [];

  for (let a = 1; a <= areas; a++) {
    lines.push({ id: `main-${a}`, address: `${a}.0`, name: `Wing ${a} main line` });
    devices.push(
      {
        id: `area-coupler-${a}`,
        type: "coupler",
        name: `Wing ${a} area coupler`,
        individualAddress: `${a}.0.0`,
        parameters: {},
      },
      {
        id: `supervision-${a}`,
        type: "switch-actuator",
        name: `Wing ${a} light supervision`,
        individualAddress: `${a}.0.1`,
        parameters: { channels: 1 },
      },
    );
    for (let l = 1; l <= linesPerArea; l++) {
      const lineId = `line-${a}-${l}`;
      lines.push({ id: lineId, address: `${a}.${l}`, name: `Wing ${a} floor ${l}` });
      devices.push({
        id: `line-coupler-${a}-${l}`,
        type: "coupler",
        name: `Wing ${a} floor ${l} line coupler`,
        individualAddress: `${a}.${l}.0`,
        parameters: {},
      });
      const panelTiles: { label: string; dpt: string; kind: "status"; address: string }[] = [];
      for (let r = 0; r < roomsPerLine; r++) {
        const room = `${a}-${l}-${r + 1}`;
        const label = `Room ${a}.${l}.${String(r + 1).padStart(2, "0")}`;
        const light = `${a}/${l}/${r * 4}`;
        const lightStatus = `${a}/${l}/${r * 4 + 1}`;
        const temperature = `${a}/${l}/${r * 4 + 2}`;
        groupAddresses.push(
          { address: light, name: `${label} light`, dpt: "1.001" },
          { address: lightStatus, name: `${label} light status`, dpt: "1.001" },
          { address: temperature, name: `${label} temperature`, dpt: "9.001" },
        );
        const ia = (n: number) => `${a}.${l}.${r * 5 + n + 1}`;
        devices.push(
          {
            id: `button-${room}`,
            type: "push-button",
            name: `${label} light button`,
            individualAddress: ia(0),
            parameters: {},
          },
          {
            id: `light-${room}`,
            type: "switch-actuator",
            name: `${label} light`,
            individualAddress: ia(1),
            parameters: { channels: 1 },
          },
          {
            id: `sensor-${room}`,
            type: "room-temperature-sensor",
            name: `${label} temperature sensor`,
            individualAddress: ia(2),
            parameters: {
              // Cycles differ a little from room to room, as real devices started at different times drift apart.
              sending: {
                mode: "on-change-and-cyclic",
                minIntervalS: 60,
                cycleS: 540 + ((r * 13 + l * 7) % 120),
              },
              sampleS: 60,
              initialC: 19 + (r % 5),
              outdoorC: 8 + a * 2,
            },
          },
        );
        links.push(
          { device: `button-${room}`, object: 0, groupAddress: light },
          { device: `button-${room}`, object: 0, groupAddress: lightStatus },
          { device: `light-${room}`, object: 0, groupAddress: light },
          { device: `light-${room}`, object: 0, groupAddress: BUILDING_ALL_OFF },
          { device: `light-${room}`, object: 1, groupAddress: lightStatus },
          { device: `supervision-${a}`, object: 0, groupAddress: lightStatus },
          { device: `sensor-${room}`, object: 0, groupAddress: temperature },
        );
        panelTiles.push({
          label: `${label} temperature`,
          dpt: "9.001",
          kind: "status",
          address: temperature,
        });
        if (r % hvacEvery === 0) {
          const hvac = (k: number) => `${a + 3}/${l}/${r * 8 + k}`;
          groupAddresses.push(
            { address: hvac(0), name: `${label} HVAC power`, dpt: "1.001" },
            { address: hvac(1), name: `${label} HVAC power status`, dpt: "1.001" },
            { address: hvac(2), name: `${label} HVAC setpoint`, dpt: "9.001" },
            { address: hvac(3), name: `${label} HVAC setpoint status`, dpt: "9.001" },
            { address: hvac(4), name: `${label} HVAC room temperature`, dpt: "9.001" },
          );
          devices.push(
            {
              id: `gateway-${room}`,
              type: "hvac-gateway",
              name: `${label} HVAC gateway`,
              individualAddress: ia(3),
              parameters: {
                role: "primary",
                systemType: "single-split",
                statusCycleS: 240 + ((r * 17 + l * 11 + a * 5) % 120),
                roomTemperatureSending: { mode: "on-change", minIntervalS: 60, cycleS: 900 },
              },
            },
            {
              id: `unit-${room}`,
              type: "indoor-unit",
              name: `${label} indoor unit`,
              // A minute per model step is plenty for a building-scale day (the default 10 s is for a bench).
              parameters: { initialRoomC: 20 + (r % 3), outdoorC: 8 + a * 2, modelStepS: 60 },
            },
          );
          unitLinks.push({
            id: `wiring-${room}`,
            name: `${label} unit wiring`,
            members: [`unit-${room}`, `gateway-${room}`],
          });
          links.push(
            { device: `gateway-${room}`, object: 0, groupAddress: hvac(0) },
            { device: `gateway-${room}`, object: 1, groupAddress: hvac(1) },
            { device: `gateway-${room}`, object: 2, groupAddress: hvac(2) },
            { device: `gateway-${room}`, object: 3, groupAddress: hvac(3) },
            { device: `gateway-${room}`, object: 12, groupAddress: hvac(4) },
          );
          panelTiles.push(
            { label: `${label} HVAC on`, dpt: "1.001", kind: "status", address: hvac(1) },
            { label: `${label} HVAC setpoint`, dpt: "9.001", kind: "status", address: hvac(3) },
            { label: `${label} HVAC room`, dpt: "9.001", kind: "status", address: hvac(4) },
          );
        }
      }
      // A panel shows at most 64 tiles (engine/devices/control-panel).
      const tiles = panelTiles.slice(0, 64);
      devices.push({
        id: `panel-${a}-${l}`,
        type: "control-panel",
        name: `Wing ${a} floor ${l} overview panel`,
        individualAddress: `${a}.0.${l + 1}`,
        parameters: { tiles: tiles.map(({ label, dpt, kind }) => ({ label, dpt, kind })) },
      });
      tiles.forEach((tile, index) =>
        links.push({ device: `panel-${a}-${l}`, object: index, groupAddress: tile.address }),
      );
    }
  }
  return {
    format: 2,
    name: options.name ?? "Generated office building",
    description: `${areas} wings of ${linesPerArea} floors, ${roomsPerLine} rooms per floor; generated for scale checks.`,
    areas: Array.from({ length: areas }, (_, i) => ({ number: i + 1, name: `Wing ${i + 1}` })),
    lines,
    testToolAddress: "0.0.250",
    groupAddresses,
    devices,
    links,
    unitLinks,
  };
}
