import { describe, expect, it } from "vitest";
import { parseGroupAddress } from "../../address";
import type { BenchInput } from "../../bench/bench-schema";
import type { TraceEvent } from "../../core/trace";
import { getDpt } from "../../dpt";
import {
  decodeTp1Frame,
  DEFAULT_HOP_COUNT,
  encodeTp1Frame,
  fromHex,
  telegramOccupancyBitTimes,
  bitTimesToUs,
  type DataFrame,
} from "../../frame";
import { createSimulation, UNIT_LINK_DELAY_US, type Simulation } from "../../sim";
import { benchSchema } from "../../bench/bench-schema";
import { checkBench } from "../../checks/check-bench";
import { gatewayObjects as O } from "./objects";

const MS = 1_000;
const S = 1_000_000;

const GA = {
  power: "1/0/0",
  powerStatus: "1/0/1",
  setpoint: "1/0/2",
  setpointStatus: "1/0/3",
  mode: "1/0/4",
  modeStatus: "1/0/5",
  fan: "1/0/6",
  fanStatus: "1/0/7",
  room: "1/0/8",
  fault: "1/0/9",
  faultText: "1/0/10",
  window: "1/0/11",
  scene: "1/0/12",
} as const;

/** A lab room: a push-button, a window contact, an HVAC gateway with its indoor unit and a secondary wall controller. */
function labBench(): BenchInput {
  const ga = (address: string, dpt: string, name: string) => ({ address, dpt, name });
  const link = (device: string, object: number, groupAddress: string) => ({
    device,
    object,
    groupAddress,
  });
  return {
    format: 1,
    name: "HVAC lab",
    lines: [{ id: "main", address: "1.1", name: "Lab line" }],
    testToolAddress: "1.1.250",
    groupAddresses: [
      ga(GA.power, "1.001", "Unit power"),
      ga(GA.powerStatus, "1.001", "Unit power status"),
      ga(GA.setpoint, "9.001", "Setpoint"),
      ga(GA.setpointStatus, "9.001", "Setpoint status"),
      ga(GA.mode, "20.105", "Mode"),
      ga(GA.modeStatus, "20.105", "Mode status"),
      ga(GA.fan, "5.100", "Fan level"),
      ga(GA.fanStatus, "5.100", "Fan level status"),
      ga(GA.room, "9.001", "Room temperature"),
      ga(GA.fault, "1.005", "Unit fault"),
      ga(GA.faultText, "16.000", "Unit fault text"),
      ga(GA.window, "1.019", "Window"),
      ga(GA.scene, "17.001", "Room scene"),
    ],
    devices: [
      {
        id: "pb",
        type: "push-button",
        name: "Door push-button",
        individualAddress: "1.1.1",
        parameters: { channels: [{ function: "toggle" }, { function: "scene", scene: 2 }] },
      },
      {
        id: "win",
        type: "binary-input",
        name: "Window contact",
        individualAddress: "1.1.2",
        parameters: {},
      },
      {
        id: "gw",
        type: "hvac-gateway",
        name: "Lab unit gateway",
        individualAddress: "1.1.10",
        parameters: {
          windowContact: true,
          scenes: [{ scene: 2, power: true, mode: "heat", fanLevel: 2, setpointC: 22 }],
        },
      },
      {
        id: "unit",
        type: "indoor-unit",
        name: "Lab indoor unit",
        parameters: { initialRoomC: 19, outdoorC: 8 },
      },
      {
        id: "wc",
        type: "wall-controller",
        name: "Lab wall controller",
        parameters: { role: "secondary" },
      },
    ],
    links: [
      link("pb", 0, GA.power),
      link("pb", 0, GA.powerStatus),
      link("pb", 1, GA.scene),
      link("win", 0, GA.window),
      link("gw", O.power, GA.power),
      link("gw", O.powerStatus, GA.powerStatus),
      link("gw", O.setpoint, GA.setpoint),
      link("gw", O.setpointStatus, GA.setpointStatus),
      link("gw", O.mode, GA.mode),
      link("gw", O.modeStatus, GA.modeStatus),
      link("gw", O.fan, GA.fan),
      link("gw", O.fanStatus, GA.fanStatus),
      link("gw", O.roomTemperature, GA.room),
      link("gw", O.fault, GA.fault),
      link("gw", O.faultText, GA.faultText),
      link("gw", O.windowContact, GA.window),
      link("gw", O.scene, GA.scene),
    ],
    unitLinks: [{ id: "lab-unit", name: "Lab unit wiring", members: ["gw", "unit", "wc"] }],
  };
}

function raw(groupAddress: string): number {
  const parsed = parseGroupAddress(groupAddress);
  if (!parsed.ok) throw new Error(parsed.error.message);
  return parsed.value;
}

type Sent = Extract<TraceEvent, { kind: "telegram.sent" }>;

/** First transmissions to an address (repetitions left out: an address nobody listens to is never acknowledged). */
function sentTo(sim: Simulation, groupAddress: string, afterUs = 0): Sent[] {
  return sim.trace.filter(
    (e): e is Sent =>
      e.kind === "telegram.sent" &&
      e.attempt === 0 &&
      e.destination === raw(groupAddress) &&
      e.timeUs >= afterUs,
  );
}

/** Start a lab and let the start-up (announcements, first unit status) settle. */
function startLab(): Simulation {
  const sim = createSimulation(labBench(), { seed: 7 });
  sim.runFor(1 * S);
  return sim;
}

// Basic course, TP1 timing: a telegram occupies the line for 50 idle + 13 per octet + 15 + 11 bit times.
const occupancyUs = (octets: number) => bitTimesToUs(telegramOccupancyBitTimes(octets));

describe("HVAC gateway on a simulated TP1 line", () => {
  it("the lab bench has no bench-check errors", () => {
    const errors = checkBench(benchSchema.parse(labBench())).filter((f) => f.severity === "error");
    expect(errors).toEqual([]);
  });

  it("a push-button switches the unit and the power status follows within the expected bus time", () => {
    const sim = startLab();
    const pressedUs = sim.nowUs;
    expect(sim.pressButton("pb", "channel-1").ok).toBe(true);
    sim.runFor(500 * MS);
    const command = sentTo(sim, GA.power, pressedUs)[0];
    const status = sentTo(sim, GA.powerStatus, pressedUs)[0];
    expect(command?.payloadHex).toBe("01");
    expect(status?.payloadHex).toBe("01");
    expect(sim.groupValue(GA.powerStatus)).toBe(true);
    expect((sim.deviceState("unit") as { power: boolean }).power).toBe(true);
    // The status needs the command on the line, a unit-link round trip and its own slot on the line:
    // at least two link delays after the command ends, at most two full occupancies (9-octet frames) plus the round trip.
    if (command === undefined || status === undefined) return;
    expect(status.timeUs).toBeGreaterThanOrEqual(command.endUs + 2 * UNIT_LINK_DELAY_US);
    expect(status.endUs - pressedUs).toBeLessThanOrEqual(
      2 * occupancyUs(9) + 2 * UNIT_LINK_DELAY_US,
    );
    // The toggle listens to the status address, so a second press switches off.
    sim.pressButton("pb", "channel-1");
    sim.runFor(500 * MS);
    expect(sim.groupValue(GA.powerStatus)).toBe(false);
  });

  it("panel telegrams set setpoint (clamped), mode and fan, each answered by its status", () => {
    // DPT spec §3.10 and §4 (20.105); clamping is common practice, no published source.
    const sim = startLab();
    sim.sendGroupWrite(GA.setpoint, 35);
    sim.sendGroupWrite(GA.mode, 3);
    sim.sendGroupWrite(GA.fan, 2);
    sim.runFor(1 * S);
    expect(sim.groupValue(GA.setpointStatus)).toBe(30);
    expect(sim.groupValue(GA.modeStatus)).toBe(3);
    expect(sim.groupValue(GA.fanStatus)).toBe(2);
    expect(
      sim.trace.some(
        (e) =>
          e.kind === "device.transition" &&
          e.deviceId === "gw" &&
          e.transition === "setpoint.clamped",
      ),
    ).toBe(true);
  });

  it("a refused DPT 20.105 code leaves the mode and re-sends its status", () => {
    const sim = startLab();
    sim.sendGroupWrite(GA.mode, 3);
    sim.runFor(1 * S);
    sim.sendGroupWrite(GA.mode, 6);
    sim.runFor(1 * S);
    expect(sim.groupValue(GA.modeStatus)).toBe(3);
    expect(
      sim.trace.some((e) => e.kind === "device.transition" && e.transition === "mode.refused"),
    ).toBe(true);
  });

  it("a scene push-button recalls the gateway's scene slot", () => {
    const sim = startLab();
    sim.pressButton("pb", "channel-2");
    sim.runFor(1 * S);
    expect(sim.groupValue(GA.powerStatus)).toBe(true);
    expect(sim.groupValue(GA.modeStatus)).toBe(1);
    expect(sim.groupValue(GA.setpointStatus)).toBe(22);
    expect(sim.groupValue(GA.fanStatus)).toBe(2);
  });

  it("an opened window stops the unit and closing it restores it", () => {
    // Common practice, no published source.
    const sim = startLab();
    sim.sendGroupWrite(GA.power, true);
    sim.runFor(1 * S);
    sim.setInput("win", "contact", true);
    sim.runFor(1 * S);
    expect(sim.groupValue(GA.window)).toBe(true);
    expect(sim.groupValue(GA.powerStatus)).toBe(false);
    sim.setInput("win", "contact", false);
    sim.runFor(1 * S);
    expect(sim.groupValue(GA.powerStatus)).toBe(true);
  });

  it("wall controller changes reach KNX as status telegrams from the gateway", () => {
    const sim = startLab();
    const beforeUs = sim.nowUs;
    sim.pressButton("wc", "power");
    sim.pressButton("wc", "setpoint-up");
    sim.runFor(1 * S);
    const status = sentTo(sim, GA.powerStatus, beforeUs);
    expect(status.map((t) => t.source)).toEqual([0x110a]);
    expect(sim.groupValue(GA.powerStatus)).toBe(true);
    expect(sim.groupValue(GA.setpointStatus)).toBe(21.5);
  });

  it("two primaries raise the fault objects and stop commands until one is made secondary", () => {
    // Common practice, no published source.
    const sim = startLab();
    expect(sim.setParameter("wc", "role", "primary").ok).toBe(true);
    sim.runFor(1 * S);
    expect(sim.groupValue(GA.fault)).toBe(true);
    expect(sim.groupValue(GA.faultText)).toBe("two primaries");
    sim.sendGroupWrite(GA.power, true);
    sim.runFor(1 * S);
    expect(sim.groupValue(GA.powerStatus)).not.toBe(true);
    expect(
      sim.trace.some(
        (e) => e.kind === "device.transition" && e.transition === "link.command-refused",
      ),
    ).toBe(true);
    sim.setParameter("wc", "role", "secondary");
    sim.runFor(1 * S);
    expect(sim.groupValue(GA.fault)).toBe(false);
    sim.sendGroupWrite(GA.power, true);
    sim.runFor(1 * S);
    expect(sim.groupValue(GA.powerStatus)).toBe(true);
  });

  it("a parameter download to the indoor unit does not raise a false link.no-primary", () => {
    const sim = startLab();
    expect(sim.setParameter("unit", "outdoorC", 2).ok).toBe(true);
    sim.runFor(30 * S);
    expect(sim.trace.some((e) => e.kind === "fault.raised" && e.fault === "link.no-primary")).toBe(
      false,
    );
  });

  it("sends the room temperature on change, never twice within 30 s", () => {
    // Common practice, no published source: 0.1 K, at least 30 s apart.
    const sim = startLab();
    sim.runFor(20 * 60 * S);
    const times = sentTo(sim, GA.room).map((t) => t.timeUs);
    expect(times.length).toBeGreaterThan(3);
    for (let i = 1; i < times.length; i++)
      expect((times[i] ?? 0) - (times[i - 1] ?? 0)).toBeGreaterThanOrEqual(30 * S);
  });

  it("puts only valid TP1 frames on the line, each carrying a value its address's DPT decodes", () => {
    // Basic course / TP1 conformance §10: standard frame layout with check octet; DPT spec for the payloads.
    const sim = startLab();
    sim.pressButton("pb", "channel-1");
    sim.sendGroupWrite(GA.setpoint, 23.5);
    sim.sendGroupWrite(GA.mode, 14);
    sim.pressButton("pb", "channel-2");
    sim.setInput("win", "contact", true);
    sim.runFor(2 * 60 * S);
    const bench = labBench();
    const sent = sim.trace.filter((e): e is Sent => e.kind === "telegram.sent");
    expect(sent.length).toBeGreaterThan(10);
    for (const telegram of sent) {
      const payload = fromHex(telegram.payloadHex);
      expect(payload).toBeDefined();
      if (payload === undefined) continue;
      const frame: DataFrame = {
        priority: telegram.priority,
        repeated: telegram.repeated,
        source: telegram.source,
        destination: telegram.destination,
        addressType: "group",
        hopCount: DEFAULT_HOP_COUNT,
        service: telegram.service,
        payload,
        shortPayload: telegram.shortPayload,
      };
      const bytes = encodeTp1Frame(frame);
      expect(bytes.length).toBe(telegram.octets);
      const decoded = decodeTp1Frame(bytes);
      expect(decoded.ok).toBe(true);
      if (!decoded.ok) continue;
      expect(decoded.value).toEqual(frame);
      const dptId = bench.groupAddresses?.find(
        (ga) => raw(ga.address) === telegram.destination,
      )?.dpt;
      const dpt = dptId === undefined ? undefined : getDpt(dptId);
      expect(dpt, `DPT of ${telegram.destination}`).toBeDefined();
      if (telegram.service !== "GroupValue_Read")
        expect(dpt?.decode(payload).ok, `${dptId} payload ${telegram.payloadHex}`).toBe(true);
    }
  });
});
