import { describe, expect, it } from "vitest";
import { gatewayFixture } from "./gateway-fixture";
import { gatewayObjects as O } from "./objects";

// DPT spec §4 (20.102: 0 auto, 1 comfort, 2 standby, 3 economy, 4 building protection) and §3.1
// (1.018: 1 occupied); the setback values and their direction are common practice, no
// published source.
describe("operating mode and presence set the setpoint back", () => {
  const heating = () =>
    gatewayFixture({
      gateway: { operatingMode: true },
      unit: { initialPower: true, initialMode: "heat" },
    });

  it("while heating: economy 4 K down, standby 2 K down, building protection 7 °C, comfort back", () => {
    const f = heating();
    f.write(O.setpoint, 21);
    f.write(O.operatingMode, 3);
    expect(f.unit().setpointC).toBe(17);
    expect(f.lastSent(O.operatingModeStatus)).toBe(3);
    f.write(O.operatingMode, 2);
    expect(f.unit().setpointC).toBe(19);
    f.write(O.operatingMode, 4);
    expect(f.unit().setpointC).toBe(7);
    f.write(O.operatingMode, 1);
    expect(f.unit().setpointC).toBe(21);
  });

  it("while cooling, economy sets the setpoint up", () => {
    const f = gatewayFixture({
      gateway: { operatingMode: true },
      unit: { initialPower: true, initialMode: "cool", initialRoomC: 26 },
    });
    f.write(O.setpoint, 24);
    f.write(O.operatingMode, 3);
    expect(f.unit().setpointC).toBe(28);
  });

  it("an empty room in comfort runs standby; occupied again, comfort", () => {
    const f = heating();
    f.write(O.setpoint, 21);
    f.write(O.presence, false);
    expect(f.unit().setpointC).toBe(19);
    expect(f.lastSent(O.operatingModeStatus)).toBe(2);
    f.write(O.presence, true);
    expect(f.unit().setpointC).toBe(21);
  });

  it("a new comfort setpoint during economy is taken as comfort and run set back", () => {
    const f = heating();
    f.write(O.setpoint, 21);
    f.write(O.operatingMode, 3);
    f.write(O.setpoint, 22);
    expect(f.unit().setpointC).toBe(18);
  });
});
