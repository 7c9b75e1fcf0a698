import type { BenchInput } from "../../engine";

/**
 * A generated bench for size checks: `rooms` rooms on up to 15 lines, each
 * room with a rocker, a relay and a room sensor (3 devices), and per room ten
 * group addresses (switch, status, scene, setpoint, temperature ...), so 100
 * rooms give 300 devices and 1,000 addresses. Deterministic: no randomness.
 */
export function largeBench(rooms = 100): BenchInput {
  const lines = Array.from({ length: Math.min(15, Math.ceil(rooms / 8)) }, (_, i) => ({
    id: `line-${i + 1}`,
    address: `1.${i + 1}`,
    name: `Floor ${i + 1}`,
  }));
  const groupAddresses: NonNullable<BenchInput["groupAddresses"]> = [];
  const devices: NonNullable<BenchInput["devices"]> = [];
  const links: NonNullable<BenchInput["links"]> = [];
  // Ten addresses per room: (name, DPT). Sizes from DPT spec §3: 1.x 1 bit, 5.x/17.x 1 octet, 9.x 2 octets.
  const perRoom: readonly [string, string][] = [
    ["light", "1.001"],
    ["light status", "1.001"],
    ["blind", "1.008"],
    ["blind position", "5.001"],
    ["scene", "17.001"],
    ["temperature", "9.001"],
    ["setpoint", "9.001"],
    ["setpoint status", "9.001"],
    ["presence", "1.018"],
    ["window", "1.019"],
  ];
  for (let room = 0; room < rooms; room++) {
    const line = lines[room % lines.length]!;
    const slot = Math.floor(room / lines.length);
    const main = 1 + (room >> 5);
    const middle = (room >> 2) & 7;
    const subBase = (room & 3) * 10 + 1;
    const address = (k: number) => `${main}/${middle}/${subBase + k}`;
    perRoom.forEach(([what, dpt], k) =>
      groupAddresses.push({ address: address(k), name: `Room ${room + 1} ${what}`, dpt }),
    );
    const device = (n: number) => `${line.address}.${slot * 3 + n + 1}`;
    const id = (kind: string) => `${kind}-${room + 1}`;
    devices.push(
      {
        id: id("rocker"),
        type: "push-button",
        name: `Room ${room + 1} rocker`,
        individualAddress: device(0),
        parameters: {},
      },
      {
        id: id("relay"),
        type: "switch-actuator",
        name: `Room ${room + 1} relay`,
        individualAddress: device(1),
        parameters: { channels: 1 },
      },
      {
        id: id("sensor"),
        type: "room-temperature-sensor",
        name: `Room ${room + 1} sensor`,
        individualAddress: device(2),
        parameters: {},
      },
    );
    links.push(
      { device: id("rocker"), object: 0, groupAddress: address(0) },
      { device: id("rocker"), object: 0, groupAddress: address(1) },
      { device: id("relay"), object: 0, groupAddress: address(0) },
      { device: id("relay"), object: 1, groupAddress: address(1) },
      { device: id("sensor"), object: 0, groupAddress: address(5) },
    );
  }
  return {
    format: 1,
    name: `Generated bench, ${rooms} rooms`,
    lines,
    testToolAddress: "1.1.250",
    groupAddresses,
    devices,
    links,
  };
}
