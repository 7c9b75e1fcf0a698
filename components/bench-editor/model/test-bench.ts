import { benchSchema, type Bench } from "@/engine/bench";

/** A small bench for the editor's tests: a rocker, a relay and three addresses. */
export function testBench(): Bench {
  return benchSchema.parse({
    format: 1,
    name: "Editor test bench",
    lines: [
      { id: "main", address: "1.1", name: "Main line" },
      { id: "upper", address: "1.2", name: "Upper floor" },
    ],
    testToolAddress: "1.1.250",
    groupAddresses: [
      { address: "1/0/1", name: "Hall light", dpt: "1.001" },
      { address: "1/0/2", name: "Hall light status", dpt: "1.001" },
      { address: "1/0/3", name: "Hall dim value", dpt: "5.001" },
      { address: "3/1/2", name: "Lab setpoint", dpt: "9.001" },
    ],
    devices: [
      {
        id: "pb-hall",
        type: "push-button",
        name: "Hall rocker",
        individualAddress: "1.1.1",
        parameters: {},
      },
      {
        id: "act-hall",
        type: "switch-actuator",
        name: "Hall relay",
        individualAddress: "1.1.2",
        parameters: { channels: 1 },
      },
    ],
    links: [
      { device: "pb-hall", object: 0, groupAddress: "1/0/1" },
      { device: "act-hall", object: 0, groupAddress: "1/0/1" },
      { device: "act-hall", object: 1, groupAddress: "1/0/2" },
    ],
  });
}
