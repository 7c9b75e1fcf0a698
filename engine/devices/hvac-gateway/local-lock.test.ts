import { describe, expect, it } from "vitest";
import { gatewayFixture } from "./gateway-fixture";
import { gatewayObjects as O } from "./objects";

// Common practice, no published source: locking the local wall controller from KNX (a hotel
// room, a classroom) stops its keys; KNX commands still work.
describe("local operation lock", () => {
  const fixture = () =>
    gatewayFixture({
      gateway: { localLock: true },
      wallController: { role: "secondary" },
    });

  it("locks the wall controller's keys and reports it on the status", () => {
    const f = fixture();
    f.write(O.localLock, true);
    expect(f.lastSent(O.localLockStatus)).toBe(true);
    f.press("power");
    expect(f.unit().power).toBe(false);
    expect(f.harness.transitionNames("wc")).toContain("local.locked");
  });

  it("does not block KNX commands", () => {
    const f = fixture();
    f.write(O.localLock, true);
    f.write(O.power, true);
    expect(f.unit().power).toBe(true);
    expect(f.lastSent(O.powerStatus)).toBe(true);
  });

  it("released, the keys work again", () => {
    const f = fixture();
    f.write(O.localLock, true);
    f.write(O.localLock, false);
    expect(f.lastSent(O.localLockStatus)).toBe(false);
    f.press("power");
    expect(f.unit().power).toBe(true);
  });
});
