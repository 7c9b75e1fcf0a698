/*
 * Generates the third demo bench, "Wrenhallow Hotel" (an invented hotel): a
 * main line with three guest floors as lines, each joined to it by a line
 * coupler. Run `npx tsx test/harness/hotel-bench.ts` to rewrite
 * scenarios/benches/wrenhallow-hotel.bench.json (then `npx prettier --write` it).
 *
 * Addresses: main group = floor (1..3), middle group = function, sub = room
 * (1..12); main group 4 = central functions on the main line.
 *   f/0/r light switch        f/1/r light status
 *   f/2/r HVAC power status   f/3/r setpoint status   f/4/r mode status
 *   f/5/r fan level status    f/6/r room sensor temperature
 *   f/7/r unit room temperature, f/7/(100+r) unit fault, f/7/(200+r) fault text
 *   4/0/1 all lights off      4/1/1 HVAC morning start (all units on)
 * Individual addresses on floor f (line 1.f): coupler 1.f.0, push-buttons
 * 1.f.r, gateways 1.f.(20+r), room sensors 1.f.(40+r), light actuators
 * 1.f.61-62; the central push-button is 1.0.1 and the test tool 1.0.250.
 */
import { writeFileSync } from "node:fs";
import { fileURLToPath } from "node:url";

export const HOTEL_FLOORS = 3;
export const HOTEL_ROOMS_PER_FLOOR = 12;
const CHANNELS_PER_ACTUATOR = 6;

interface Device {
  id: string;
  type: string;
  name: string;
  line?: string;
  individualAddress?: string;
  parameters: Record<string, unknown>;
}

/** The hotel bench document (format 2, the topology format). */
export function hotelBench(): Record<string, unknown> {
  const lines = [{ id: "line-main", address: "1.0", name: "Main line" }];
  const groupAddresses: { address: string; name: string; dpt: string }[] = [
    { address: "4/0/1", name: "All lights off", dpt: "1.001" },
    { address: "4/1/1", name: "HVAC morning start", dpt: "1.001" },
  ];
  const devices: Device[] = [
    {
      id: "pb-central",
      type: "push-button",
      name: "Reception central push-button",
      line: "line-main",
      individualAddress: "1.0.1",
      parameters: { channels: [{ function: "off" }, { function: "on" }] },
    },
  ];
  const links: { device: string; object: number; groupAddress: string }[] = [
    { device: "pb-central", object: 0, groupAddress: "4/0/1" },
    { device: "pb-central", object: 1, groupAddress: "4/1/1" },
  ];
  const unitLinks: { id: string; name: string; members: string[] }[] = [];
  const ga = (address: string, name: string, dpt: string) => {
    groupAddresses.push({ address, name, dpt });
    return address;
  };
  const link = (device: string, object: number, groupAddress: string) =>
    links.push({ device, object, groupAddress });

  for (let floor = 1; floor <= HOTEL_FLOORS; floor++) {
    const line = `line-floor-${floor}`;
    lines.push({ id: line, address: `1.${floor}`, name: `Floor ${floor}` });
    devices.push({
      id: `lc-floor-${floor}`,
      type: "coupler",
      name: `Floor ${floor} line coupler`,
      line,
      individualAddress: `1.${floor}.0`,
      parameters: { groupTelegrams: "filter", individualTelegrams: "route" },
    });
    const actuators = Math.ceil(HOTEL_ROOMS_PER_FLOOR / CHANNELS_PER_ACTUATOR);
    for (let a = 1; a <= actuators; a++) {
      devices.push({
        id: `act-floor-${floor}-${a}`,
        type: "switch-actuator",
        name: `Floor ${floor} lights actuator ${a}`,
        line,
        individualAddress: `1.${floor}.${60 + a}`,
        parameters: { channels: CHANNELS_PER_ACTUATOR, statusObjects: true },
      });
    }
    for (let r = 1; r <= HOTEL_ROOMS_PER_FLOOR; r++) {
      const room = `${floor}${String(r).padStart(2, "0")}`;
      const label = `Room ${room}`;
      const switchGa = ga(`${floor}/0/${r}`, `${label} light switch`, "1.001");
      const statusGa = ga(`${floor}/1/${r}`, `${label} light status`, "1.001");
      const powerGa = ga(`${floor}/2/${r}`, `${label} HVAC power status`, "1.001");
      const setpointGa = ga(`${floor}/3/${r}`, `${label} setpoint status`, "9.001");
      const modeGa = ga(`${floor}/4/${r}`, `${label} mode status`, "20.105");
      const fanGa = ga(`${floor}/5/${r}`, `${label} fan level status`, "5.100");
      const sensorGa = ga(`${floor}/6/${r}`, `${label} room sensor temperature`, "9.001");
      const unitTempGa = ga(`${floor}/7/${r}`, `${label} unit room temperature`, "9.001");
      const faultGa = ga(`${floor}/7/${100 + r}`, `${label} HVAC fault`, "1.005");
      const faultTextGa = ga(`${floor}/7/${200 + r}`, `${label} HVAC fault text`, "16.000");

      const pb = `pb-${room}`;
      devices.push({
        id: pb,
        type: "push-button",
        name: `${label} push-button`,
        line,
        individualAddress: `1.${floor}.${r}`,
        parameters: { channels: [{ function: "toggle" }] },
      });
      link(pb, 0, switchGa);
      link(pb, 0, statusGa);

      const actuator = `act-floor-${floor}-${Math.ceil(r / CHANNELS_PER_ACTUATOR)}`;
      const channel = (r - 1) % CHANNELS_PER_ACTUATOR;
      link(actuator, channel * 2, switchGa);
      link(actuator, channel * 2, "4/0/1");
      link(actuator, channel * 2 + 1, statusGa);

      const gw = `gw-${room}`;
      devices.push({
        id: gw,
        type: "hvac-gateway",
        name: `${label} HVAC gateway`,
        line,
        individualAddress: `1.${floor}.${20 + r}`,
        parameters: {
          role: "primary",
          systemType: "single-split",
          modeControl: "full",
          fanLevels: 3,
          fanAuto: true,
          setpointMinC: 17,
          setpointMaxC: 27,
          roomTemperatureSource: "external",
          roomTemperatureSending: { mode: "on-change", deltaK: 0.3, minIntervalS: 120 },
          // A floor's twelve gateways get start-up delays 2 s apart, so their statuses after bus
          // power return come one gateway at a time instead of flooding the line together
          // (common practice, no published source).
          startupDelayS: 2 * r,
        },
      });
      link(gw, 0, "4/1/1");
      link(gw, 1, powerGa);
      link(gw, 3, setpointGa);
      link(gw, 5, modeGa);
      link(gw, 9, fanGa);
      link(gw, 12, unitTempGa);
      link(gw, 13, sensorGa);
      link(gw, 18, faultGa);
      link(gw, 19, faultTextGa);

      const iu = `iu-${room}`;
      devices.push({
        id: iu,
        type: "indoor-unit",
        name: `${label} indoor unit`,
        // Rooms start a little apart, as after a night: a deterministic spread, not random.
        parameters: { initialRoomC: 17 + ((floor * 7 + r * 3) % 10) / 5, outdoorC: 6 },
      });
      unitLinks.push({ id: `link-${room}`, name: `${label} unit wiring`, members: [iu, gw] });

      const sensor = `ts-${room}`;
      devices.push({
        id: sensor,
        type: "room-temperature-sensor",
        name: `${label} room sensor`,
        line,
        individualAddress: `1.${floor}.${40 + r}`,
        parameters: {
          sending: { mode: "on-change-and-cyclic", deltaK: 0.2, minIntervalS: 60, cycleS: 900 },
          initialC: 17 + ((floor * 7 + r * 3) % 10) / 5,
        },
      });
      link(sensor, 0, sensorGa);
    }
  }

  return {
    format: 2,
    name: "Wrenhallow Hotel",
    description:
      "An invented 36-room hotel (no real place): a main line by reception with three guest floors as lines 1.1-1.3, each joined to it by a line coupler that filters group telegrams by a table generated from the links. Per room a push-button on a lights actuator channel, an HVAC gateway (primary) with its indoor unit and a room sensor feeding the gateway. The reception's central push-button sends all lights off (4/0/1) and the HVAC morning start (4/1/1) to every floor through the couplers. Addresses: main group = floor, middle group = function, sub = room; main group 4 = central.",
    areas: [{ number: 1, name: "Hotel" }],
    lines,
    testToolAddress: "1.0.250",
    groupAddresses,
    devices,
    links,
    unitLinks,
  };
}

/**
 * The exercise copy (scenarios/exercises/late-address.bench.json): after the
 * couplers' filter tables were written, a third central channel was added,
 * "Night round lights off" on 4/0/3. Floors 1 and 3 had their tables
 * regenerated; floor 2 still holds the table written before the change, so its
 * coupler blocks 4/0/3 (its checks report `topology.filter-blocks`).
 */
export function hotelLateAddressBench(): Record<string, unknown> {
  const bench = hotelBench() as {
    name: string;
    description: string;
    groupAddresses: { address: string; name: string; dpt: string }[];
    devices: Device[];
    links: { device: string; object: number; groupAddress: string }[];
  };
  bench.name = "Wrenhallow Hotel, late address exercise";
  bench.description =
    "Exercise copy of the invented Wrenhallow Hotel: a night round lights off (4/0/3) was added to the reception's central push-button after the couplers' filter tables were written. Floors 1 and 3 were regenerated, floor 2 was not: find why its lights stay on and regenerate its table.";
  bench.groupAddresses.push({ address: "4/0/3", name: "Night round lights off", dpt: "1.001" });
  const central = bench.devices.find((d) => d.id === "pb-central")!;
  central.parameters = { channels: [{ function: "off" }, { function: "on" }, { function: "off" }] };
  bench.links.push({ device: "pb-central", object: 2, groupAddress: "4/0/3" });
  for (const link of [...bench.links])
    if (link.groupAddress === "4/0/1")
      bench.links.push({ device: link.device, object: link.object, groupAddress: "4/0/3" });
  for (let floor = 1; floor <= HOTEL_FLOORS; floor++) {
    const coupler = bench.devices.find((d) => d.id === `lc-floor-${floor}`)!;
    coupler.parameters = {
      ...coupler.parameters,
      filterTable: floor === 2 ? ["4/0/1", "4/1/1"] : ["4/0/1", "4/0/3", "4/1/1"],
    };
  }
  return bench;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const write = (relative: string, document: unknown) => {
    const target = fileURLToPath(new URL(`../../scenarios/${relative}`, import.meta.url));
    writeFileSync(target, `${JSON.stringify(document, null, 2)}\n`);
    console.log(`wrote ${target}`);
  };
  write("benches/wrenhallow-hotel.bench.json", hotelBench());
  write("exercises/late-address.bench.json", hotelLateAddressBench());
}
