import { cleanup, render, screen, within } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import type { RoomSample } from "@/components/sim/sim-protocol";
import { RoomTemperatureChart } from "./room-temperature-chart";

afterEach(cleanup);

const names = new Map([
  ["iu-front", "Front unit"],
  ["iu-rear", "Rear unit"],
]);

describe("RoomTemperatureChart", () => {
  it("charts a bench room once, with the setpoint of each unit in it", () => {
    const samples: RoomSample[] = [0, 1, 2].map((second) => ({
      timeUs: second * 1_000_000,
      roomId: "lab",
      roomC: 19 + second / 10,
      units: [
        { unitId: "iu-front", setpointC: 23, power: true },
        { unitId: "iu-rear", setpointC: 21.5, power: false },
      ],
    }));
    render(<RoomTemperatureChart name="Lab room" samples={samples} unitNames={names} />);
    const chart = screen.getByRole("figure", {
      name: "Room temperature and setpoints in Lab room",
    });
    expect(chart.getAttribute("data-room")).toBe("19.2");
    expect(chart.textContent).toContain("Lab room: room 19.20 °C");
    const units = within(chart).getAllByRole("listitem");
    expect(
      units.map((u) => [u.getAttribute("data-unit"), u.getAttribute("data-setpoint")]),
    ).toEqual([
      ["iu-front", "23"],
      ["iu-rear", "21.5"],
    ]);
    expect(units[1]!.textContent).toBe("Rear unit 21.5 °C (off)");
  });

  it("says so for a room with no unit in it", () => {
    render(
      <RoomTemperatureChart
        name="Store"
        samples={[{ timeUs: 0, roomId: "store", roomC: 15, units: [] }]}
        unitNames={names}
      />,
    );
    expect(screen.getByRole("figure").textContent).toContain("no unit in this room");
  });

  it("charts a unit in no room as its own room, as before rooms", () => {
    render(
      <RoomTemperatureChart
        name="Front unit"
        samples={[{ timeUs: 0, unitId: "iu-front", roomC: 18, setpointC: 22, power: true }]}
        unitNames={names}
      />,
    );
    const chart = screen.getByRole("figure", {
      name: "Room temperature and setpoint of Front unit",
    });
    expect(chart.getAttribute("data-setpoint")).toBe("22");
    expect(chart.textContent).toContain("setpoint 22.0 °C");
  });
});
