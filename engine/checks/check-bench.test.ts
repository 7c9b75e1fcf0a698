import { z } from "zod";
import { beforeAll, describe, expect, it } from "vitest";
import { benchSchema, type Bench, type BenchInput } from "../bench/bench-schema";
import { flags, registerDeviceType, type DeviceType } from "../devices";
import {
  roomTemperatureSendingConditions,
  roomTemperatureSendingSchema,
} from "../devices/hvac/room-temperature-sending";
import { hvacGatewayType } from "../devices/hvac-gateway/hvac-gateway";
import { wallControllerType } from "../devices/wall-controller/wall-controller";
import { telegramOccupancyUs } from "../frame";
import { benchCheckRules, checkBench } from "./check-bench";
import { estimateLineLoad } from "./line-load";
import { benchView } from "./bench-view";
import { lightsFixture } from "@/test/harness/fixture-benches";

// A test-only sensor: one 9.001 status object and the HVAC family's room-temperature sending block,
// declared through the sending-conditions hook (one value per second when no minimum interval).
const loadSensorType: DeviceType<{ sending: z.infer<typeof roomTemperatureSendingSchema> }, null> =
  {
    id: "test-load-sensor",
    label: "Test load sensor",
    description: "Sends a temperature as configured; used by the line-load check tests.",
    medium: "knx",
    parameters: z.object({
      sending: roomTemperatureSendingSchema.default({
        mode: "on-change",
        deltaK: 0.1,
        minIntervalS: 30,
        cycleS: 600,
      }),
    }),
    groupObjects: () => [
      { number: 0, name: "Temperature", dpt: "9.001", flags: flags("CRT"), role: "status" },
    ],
    buttons: () => [],
    initialState: () => null,
    transition: (state) => ({ state, effects: [] }),
    sendingConditions: (p) => roomTemperatureSendingConditions(p.sending, "sending", 0, 1),
  };

beforeAll(() => {
  registerDeviceType(loadSensorType);
  // Registering the same type object twice is allowed, so this stays right once the catalogue lists them.
  registerDeviceType(wallControllerType);
  registerDeviceType(hvacGatewayType);
});

function bench(input: Partial<BenchInput>): Bench {
  return benchSchema.parse({
    format: 1,
    name: "fixture",
    lines: [{ id: "line-1", address: "1.1", name: "Line 1" }],
    testToolAddress: "1.1.250",
    ...input,
  });
}

// A button switching an actuator, with the status fed back to the button: nothing to report.
const lightsOk = lightsFixture().named("fixture").build();

const rulesOf = (b: Bench, rule: string) => checkBench(b, { rules: [rule] });

describe("checkBench", () => {
  it("finds nothing on a correctly wired bench", () => {
    expect(checkBench(bench(lightsOk))).toEqual([]);
  });

  it("has a rule for each id, each with a title", () => {
    const ids = benchCheckRules.map((rule) => rule.id);
    expect(new Set(ids).size).toBe(ids.length);
    for (const id of [
      "address.mixed-sizes",
      "address.no-sender",
      "address.no-listener",
      "object.status-unlinked",
      "device.duplicate-individual-address",
      "address.dpt-meaning",
      "address.several-read-responders",
      "object.status-on-command-address",
      "object.read-on-init-unanswered",
      "indoor-unit.two-primaries",
      "gateway.external-temperature-on-secondary",
      "panel.preset-out-of-range",
      "line.expected-load",
    ]) {
      expect(ids).toContain(id);
    }
  });

  describe("address.mixed-sizes", () => {
    it("fails: a 1-bit switch and a 1-octet value on one address", () => {
      // DPT spec §1.3.1: 1.001 is 1 bit (in the APCI octet), 5.001 one octet after it.
      const b = bench({
        ...lightsOk,
        devices: [
          ...lightsOk.devices,
          {
            id: "pb-2",
            type: "push-button",
            name: "Dim button",
            individualAddress: "1.1.3",
            parameters: { channels: [{ function: "value", percent: 50 }] },
          },
        ],
        links: [...lightsOk.links, { device: "pb-2", object: 0, groupAddress: "1/0/1" }],
      });
      const findings = rulesOf(b, "address.mixed-sizes");
      expect(findings).toHaveLength(1);
      expect(findings[0]).toMatchObject({ severity: "error", location: { groupAddress: "1/0/1" } });
      expect(findings[0]!.message).toContain(
        'Dim button (pb-2) object 0 "Value 1" is 5.001 (8 bit)',
      );
    });
    it("passes: all objects on each address are 1 bit", () => {
      expect(rulesOf(bench(lightsOk), "address.mixed-sizes")).toEqual([]);
    });
  });

  describe("address.no-sender", () => {
    it("fails: the actuator listens on an address nothing sends on", () => {
      const b = bench({ ...lightsOk, links: lightsOk.links.filter((l) => l.device !== "pb-1") });
      const findings = rulesOf(b, "address.no-sender");
      expect(findings.map((f) => f.location.groupAddress)).toEqual(["1/0/1"]);
      expect(findings[0]!.message).toContain('Lights actuator (act-1) object 0 "Switch 1" listen');
    });
    it("passes: the button sends on the actuator's address", () => {
      expect(rulesOf(bench(lightsOk), "address.no-sender")).toEqual([]);
    });
  });

  describe("address.no-listener", () => {
    it("fails: the button's command reaches no object", () => {
      const b = bench({
        ...lightsOk,
        links: lightsOk.links.filter((l) => !(l.device === "act-1" && l.object === 0)),
      });
      const findings = rulesOf(b, "address.no-listener");
      expect(findings).toContainEqual(
        expect.objectContaining({ severity: "warning", location: { groupAddress: "1/0/1" } }),
      );
    });
    it("reports a status nobody listens to as info only", () => {
      const b = bench({
        ...lightsOk,
        links: lightsOk.links.filter((l) => !(l.device === "pb-1" && l.groupAddress === "1/1/1")),
      });
      const findings = rulesOf(b, "address.no-listener");
      expect(findings).toEqual([
        expect.objectContaining({ severity: "info", location: { groupAddress: "1/1/1" } }),
      ]);
      // Basic course / knx-reference.md TP1 timing: no acknowledgement -> up to 3 repetitions.
      expect(findings[0]!.message).toContain("each telegram goes out four times");
    });
    it("passes: both addresses have listeners", () => {
      expect(rulesOf(bench(lightsOk), "address.no-listener")).toEqual([]);
    });
  });

  describe("object.status-unlinked", () => {
    it("fails: the actuator's status object has no address", () => {
      const b = bench({
        ...lightsOk,
        links: lightsOk.links.filter((l) => !(l.device === "act-1" && l.object === 1)),
      });
      expect(rulesOf(b, "object.status-unlinked")).toEqual([
        expect.objectContaining({ severity: "warning", location: { device: "act-1", object: 1 } }),
      ]);
    });
    it("passes: with status objects turned off there is nothing to link", () => {
      const devices = [
        lightsOk.devices[0]!,
        { ...lightsOk.devices[1]!, parameters: { statusObjects: false } },
      ];
      const b = bench({
        ...lightsOk,
        devices,
        links: lightsOk.links.filter((l) => !(l.device === "act-1" && l.object === 1)),
      });
      expect(rulesOf(b, "object.status-unlinked")).toEqual([]);
    });
  });

  describe("device.duplicate-individual-address", () => {
    it("fails: two devices on 1.1.2, and a device on the test tool's address", () => {
      const devices = [
        { ...lightsOk.devices[0]!, individualAddress: "1.1.250" },
        lightsOk.devices[1]!,
        {
          id: "act-2",
          type: "switch-actuator",
          name: "Second actuator",
          individualAddress: "1.1.2",
          parameters: {},
        },
      ];
      const findings = rulesOf(
        bench({ ...lightsOk, devices }),
        "device.duplicate-individual-address",
      );
      expect(findings.map((f) => f.message).sort()).toEqual([
        "individual address 1.1.2 is used by act-1 and act-2",
        "individual address 1.1.250 is used by the test tool and pb-1",
      ]);
    });
    it("passes: every address is different", () => {
      expect(rulesOf(bench(lightsOk), "device.duplicate-individual-address")).toEqual([]);
    });
  });

  describe("room.external-sensor-elsewhere", () => {
    // A gateway on external room temperature (3/0/1) for unit iu in room "a", the sensor in `sensorRoom`.
    const rooms = (sensorRoom: string | undefined, declared = true) =>
      bench({
        ...(declared
          ? {
              rooms: [
                { id: "a", name: "Room A" },
                { id: "b", name: "Room B" },
              ],
            }
          : {}),
        groupAddresses: [{ address: "3/0/1", name: "Room temperature", dpt: "9.001" }],
        devices: [
          {
            id: "gw",
            type: "hvac-gateway",
            name: "Gateway",
            individualAddress: "1.1.20",
            parameters: { roomTemperatureSource: "external" },
          },
          {
            id: "iu",
            type: "indoor-unit",
            name: "Unit",
            ...(declared ? { room: "a" } : {}),
            parameters: {},
          },
          {
            id: "rts",
            type: "room-temperature-sensor",
            name: "Sensor",
            individualAddress: "1.1.31",
            ...(sensorRoom === undefined ? {} : { room: sensorRoom }),
            parameters: {},
          },
        ],
        links: [
          { device: "rts", object: 0, groupAddress: "3/0/1" },
          { device: "gw", object: 13, groupAddress: "3/0/1" },
        ],
        unitLinks: [{ id: "wiring", members: ["gw", "iu"] }],
      });
    it("warns: the unit heats room A while it reads a sensor in room B, or in no room", () => {
      // Common practice, no published source: a unit controls on a sensor in the room it conditions.
      expect(rulesOf(rooms("b"), "room.external-sensor-elsewhere")).toEqual([
        expect.objectContaining({
          severity: "warning",
          message: expect.stringContaining(
            "iu (room Room A) on the room temperature from rts (room Room B)",
          ),
          location: { device: "gw", object: 13 },
        }),
      ]);
      expect(rulesOf(rooms(undefined), "room.external-sensor-elsewhere")).toHaveLength(1);
    });
    it("passes: sensor and unit in one room, or a bench that declares no rooms", () => {
      expect(rulesOf(rooms("a"), "room.external-sensor-elsewhere")).toEqual([]);
      expect(rulesOf(rooms(undefined, false), "room.external-sensor-elsewhere")).toEqual([]);
    });
    it("room.device-without-room warns about a sensor left out of the declared rooms only", () => {
      expect(rulesOf(rooms(undefined), "room.device-without-room")).toEqual([
        expect.objectContaining({ severity: "warning", location: { device: "rts" } }),
      ]);
      expect(rulesOf(rooms("a"), "room.device-without-room")).toEqual([]);
      expect(rulesOf(rooms(undefined, false), "room.device-without-room")).toEqual([]);
    });
  });

  describe("gateway.external-temperature-on-secondary", () => {
    const gateway = (role: string) =>
      bench({
        devices: [
          {
            id: "gw-1",
            type: "hvac-gateway",
            name: "Gateway",
            individualAddress: "1.1.20",
            parameters: { role, roomTemperatureSource: "external" },
          },
        ],
      });
    it("fails: a secondary gateway takes the room temperature from KNX", () => {
      // Common practice, no published source (knx-reference.md "Trade practice"): only the primary may.
      expect(rulesOf(gateway("secondary"), "gateway.external-temperature-on-secondary")).toEqual([
        expect.objectContaining({
          severity: "error",
          location: { device: "gw-1", parameter: "roomTemperatureSource" },
        }),
      ]);
    });
    it("passes: the primary gateway takes it", () => {
      expect(rulesOf(gateway("primary"), "gateway.external-temperature-on-secondary")).toEqual([]);
    });
  });

  describe("device.unknown-type and device.parameters-invalid", () => {
    it("fails: a type the catalogue lacks, and a parameter the type refuses", () => {
      const b = bench({
        devices: [
          { id: "x-1", type: "fog-machine", name: "Fog", individualAddress: "1.1.1" },
          {
            id: "act-1",
            type: "switch-actuator",
            name: "Actuator",
            individualAddress: "1.1.2",
            parameters: { channels: 9 },
          },
        ],
      });
      expect(
        checkBench(b)
          .filter((f) => f.severity === "error")
          .map((f) => [f.rule, f.location]),
      ).toEqual([
        ["device.parameters-invalid", { device: "act-1", parameter: "channels" }],
        ["device.unknown-type", { device: "x-1" }],
      ]);
    });
  });

  // What one device's parameters get wrong on their own is left to its schema: reported once.
  it("a scene number outside 1..64 is reported once, by the type's schema", () => {
    // DPT spec §3 (17.001 / 18.001): scenes 1..64 travel as 0..63.
    const b = bench({
      devices: [
        {
          id: "gw-1",
          type: "hvac-gateway",
          name: "Gateway",
          individualAddress: "1.1.20",
          parameters: { scenes: [{ scene: 2 }, { scene: 70 }] },
        },
      ],
    });
    expect(
      checkBench(b)
        .filter((f) => f.severity === "error")
        .map((f) => [f.rule, f.location.parameter]),
    ).toEqual([["device.parameters-invalid", "scenes.1.scene"]]);
  });

  it("line.expected-load: counts a gateway's room-temperature sending with its defaults", () => {
    // Defaults: on change, at most every 30 s -> 1/30 telegram/s of 11 octets.
    const b = bench({
      devices: [{ id: "gw-1", type: "hvac-gateway", name: "Gateway", individualAddress: "1.1.20" }],
      groupAddresses: [{ address: "3/0/1", name: "Room temperature", dpt: "9.001" }],
      links: [{ device: "gw-1", object: 12, groupAddress: "3/0/1" }],
    });
    const [line] = estimateLineLoad(benchView(b));
    expect(line!.telegramsPerSecond).toBeCloseTo(1 / 30, 9);
    expect(line!.contributions.map((c) => c.parameter)).toEqual([
      "roomTemperatureSending.minIntervalS",
    ]);
  });

  it("line.expected-load: counts a gateway's status heartbeat, one telegram per linked status object", () => {
    // statusCycleS 60: power status (1.001, 9 octets) and setpoint status (9.001, 11 octets) are
    // linked and sent again every 60 s; room temperature sending is off, unlinked statuses send nothing.
    // Occupancy per telegram: 50 idle + 13 per octet + 15 gap + 11 ack bit times (Basic course).
    const b = bench({
      devices: [
        {
          id: "gw-1",
          type: "hvac-gateway",
          name: "Gateway",
          individualAddress: "1.1.20",
          parameters: { statusCycleS: 60, roomTemperatureSending: { mode: "off" } },
        },
      ],
      groupAddresses: [
        { address: "3/0/1", name: "Power status", dpt: "1.001" },
        { address: "3/0/2", name: "Setpoint status", dpt: "9.001" },
      ],
      links: [
        { device: "gw-1", object: 1, groupAddress: "3/0/1" },
        { device: "gw-1", object: 3, groupAddress: "3/0/2" },
      ],
    });
    const [line] = estimateLineLoad(benchView(b));
    expect(line!.contributions.map((c) => c.parameter)).toEqual(["statusCycleS"]);
    expect(line!.telegramsPerSecond).toBeCloseTo(2 / 60, 9);
    expect(line!.loadPercent).toBeCloseTo(
      (telegramOccupancyUs(9) + telegramOccupancyUs(11)) / 60 / 10_000,
      9,
    );
  });

  it("line.expected-load: an object with no sending address sends nothing", () => {
    const b = bench({
      devices: [{ id: "gw-1", type: "hvac-gateway", name: "Gateway", individualAddress: "1.1.20" }],
    });
    expect(estimateLineLoad(benchView(b))[0]!.telegramsPerSecond).toBe(0);
  });

  it("inverted setpoint limits are reported once, by the type's schema", () => {
    const b = bench({
      devices: [
        {
          id: "wc-a",
          type: "wall-controller",
          name: "Controller A",
          parameters: { setpointMinC: 28, setpointMaxC: 18 },
        },
      ],
    });
    expect(
      checkBench(b)
        .filter((f) => f.severity === "error")
        .map((f) => f.rule),
    ).toEqual(["device.parameters-invalid"]);
  });

  describe("line.expected-load", () => {
    const sensors = (count: number, sending: object) =>
      bench({
        devices: Array.from({ length: count }, (_, i) => ({
          id: `sensor-${i + 1}`,
          type: "test-load-sensor",
          name: `Sensor ${i + 1}`,
          individualAddress: `1.1.${i + 1}`,
          parameters: { sending },
        })),
        groupAddresses: Array.from({ length: count }, (_, i) => ({
          address: `3/0/${i + 1}`,
          name: `Temperature ${i + 1}`,
          dpt: "9.001",
        })),
        links: Array.from({ length: count }, (_, i) => ({
          device: `sensor-${i + 1}`,
          object: 0,
          groupAddress: `3/0/${i + 1}`,
        })),
      });

    it("computes load from TP1 occupancy: 11-octet frames hold the line 219 bit times", () => {
      // Basic course: occupancy = 50 idle + 13 per octet + 15 gap + 11 ack bit times; 9.001 is 2 octets -> 11-octet frame.
      const occupancyUs = telegramOccupancyUs(11);
      expect(occupancyUs).toBe(Math.round((219 * 1e6) / 9600));
      const [line] = estimateLineLoad(benchView(sensors(10, { mode: "cyclic", cycleS: 10 })));
      expect(line!.telegramsPerSecond).toBeCloseTo(1, 9);
      expect(line!.loadPercent).toBeCloseTo(occupancyUs / 10_000, 9);
    });

    it("fails: 15 sensors sending on change every second load the line above 30 %", () => {
      // 15/s × 22.8 ms ≈ 34 %: above the 30 % warning bound, below the 60 % error bound.
      const findings = rulesOf(
        sensors(15, { mode: "on-change", minIntervalS: 1 }),
        "line.expected-load",
      );
      expect(findings).toEqual([
        expect.objectContaining({ severity: "warning", location: { line: "line-1" } }),
      ]);
      expect(findings[0]!.message).toContain("15 telegrams/s, about 34.2 %");
    });

    it("grades above the error bound as an error", () => {
      const findings = rulesOf(
        sensors(30, { mode: "on-change-and-cyclic", minIntervalS: 1, cycleS: 10 }),
        "line.expected-load",
      );
      expect(findings[0]!.severity).toBe("error");
    });

    it("passes: the common 30 s minimum interval keeps 15 sensors near 1 %", () => {
      // Common practice, no published source: 0.1 K change, at least 30 s apart.
      expect(
        rulesOf(sensors(15, { mode: "on-change", minIntervalS: 30 }), "line.expected-load"),
      ).toEqual([]);
    });
  });
});
