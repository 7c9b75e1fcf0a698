import { describe, expect, it } from "vitest";
import { faultsByDevice } from "./faults-by-device";

describe("faultsByDevice", () => {
  const bench = {
    devices: [],
    unitLinks: [{ id: "link-front", name: "Front unit wiring", members: ["iu-front", "gw-front"] }],
  };

  it("puts device faults on the device and a unit link's fault on each member, once each", () => {
    const map = faultsByDevice(
      [
        { target: "iu-front", fault: "link.two-primaries", by: "device" },
        { target: "pb-door", fault: "bus.silent", by: "user" },
        { target: "link-front", fault: "link.broken", by: "user" },
        { target: "iu-front", fault: "link.two-primaries", by: "device" },
      ],
      bench,
    );
    expect(Object.fromEntries(map)).toEqual({
      "iu-front": ["link.two-primaries", "link.broken"],
      "pb-door": ["bus.silent"],
      "gw-front": ["link.broken"],
    });
  });

  it("is empty without faults", () => {
    expect(faultsByDevice([], bench).size).toBe(0);
  });
});
