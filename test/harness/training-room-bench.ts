import type { BenchInput } from "../../engine";

/**
 * A small invented bench for the console's own tests and benchmark: a light
 * on a push-button and an actuator, one indoor unit behind an HVAC gateway
 * with a wired wall controller on its unit link, and a window contact.
 * The demo benches under scenarios/ are the real examples; this one only has
 * to exercise every panel of the console.
 */
export const trainingRoomBench: BenchInput = {
  format: 1,
  name: "Console test room",
  lines: [{ id: "main", address: "1.1", name: "Main line" }],
  testToolAddress: "1.1.250",
  groupAddresses: [
    { address: "1/0/1", name: "Ceiling light", dpt: "1.001" },
    { address: "1/0/2", name: "Ceiling light status", dpt: "1.001" },
    { address: "2/0/0", name: "Unit power", dpt: "1.001" },
    { address: "2/0/1", name: "Unit power status", dpt: "1.001" },
    { address: "2/0/2", name: "Unit setpoint", dpt: "9.001" },
    { address: "2/0/3", name: "Unit setpoint status", dpt: "9.001" },
    { address: "2/0/4", name: "Unit mode", dpt: "20.105" },
    { address: "2/0/5", name: "Unit mode status", dpt: "20.105" },
    { address: "2/0/6", name: "Room temperature", dpt: "9.001" },
    { address: "2/0/7", name: "Unit fault", dpt: "1.005" },
    { address: "2/0/8", name: "Unit scene", dpt: "17.001" },
    { address: "2/0/9", name: "Window contact", dpt: "1.019" },
  ],
  devices: [
    { id: "rocker", type: "push-button", name: "Door push-button", individualAddress: "1.1.1" },
    { id: "light", type: "switch-actuator", name: "Light actuator", individualAddress: "1.1.2" },
    {
      id: "gateway",
      type: "hvac-gateway",
      name: "Unit gateway",
      individualAddress: "1.1.10",
      parameters: {
        role: "primary",
        windowContact: true,
        scenes: [{ scene: 3, power: true, mode: "heat", fanLevel: 2, setpointC: 23 }],
      },
    },
    { id: "unit", type: "indoor-unit", name: "Indoor unit", parameters: { initialRoomC: 18 } },
    {
      id: "panel",
      type: "wall-controller",
      name: "Wall controller",
      parameters: { role: "secondary" },
    },
    { id: "window", type: "binary-input", name: "Window contact", individualAddress: "1.1.20" },
  ],
  links: [
    { device: "rocker", object: 0, groupAddress: "1/0/1" },
    { device: "rocker", object: 0, groupAddress: "1/0/2" },
    { device: "light", object: 0, groupAddress: "1/0/1" },
    { device: "light", object: 1, groupAddress: "1/0/2" },
    { device: "gateway", object: 0, groupAddress: "2/0/0" },
    { device: "gateway", object: 1, groupAddress: "2/0/1" },
    { device: "gateway", object: 2, groupAddress: "2/0/2" },
    { device: "gateway", object: 3, groupAddress: "2/0/3" },
    { device: "gateway", object: 4, groupAddress: "2/0/4" },
    { device: "gateway", object: 5, groupAddress: "2/0/5" },
    { device: "gateway", object: 12, groupAddress: "2/0/6" },
    { device: "gateway", object: 14, groupAddress: "2/0/8" },
    { device: "gateway", object: 16, groupAddress: "2/0/9" },
    { device: "gateway", object: 18, groupAddress: "2/0/7" },
    { device: "window", object: 0, groupAddress: "2/0/9" },
  ],
  unitLinks: [{ id: "unit-link", name: "Indoor unit link", members: ["gateway", "unit", "panel"] }],
};
