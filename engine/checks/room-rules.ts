import type { BenchCheckRule } from "./bench-check-rule";
import type { BenchView } from "./bench-view";
import type { CheckFinding } from "./check-finding";

/** Object number of the gateway's external room temperature input (engine/devices/hvac-gateway/objects.ts). */
const EXTERNAL_ROOM_TEMPERATURE_OBJECT = 13;

/** The indoor units on the unit links a device sits on. */
function unitsOf(view: BenchView, id: string): string[] {
  const found = new Set<string>();
  for (const link of view.bench.unitLinks)
    if (link.members.includes(id))
      for (const member of link.members)
        if (member !== id && view.devices.get(member)?.device.type === "indoor-unit")
          found.add(member);
  return [...found];
}

/** Devices that send on an address the object listens to. */
function sendersTo(view: BenchView, device: string, object: number): string[] {
  const senders = new Set<string>();
  for (const raw of view.linksOf(device, object))
    for (const member of view.addresses.get(raw)?.members ?? [])
      if (member.sending && member.device !== device) senders.add(member.device);
  return [...senders];
}

const roomName = (view: BenchView, room: string | undefined) =>
  room === undefined
    ? "no room"
    : `room ${view.bench.rooms?.find((r) => r.id === room)?.name ?? room}`;

/**
 * A unit that controls on a KNX room temperature measured in another room
 * heats one room while reading another: it never reaches its setpoint where
 * it is, or overshoots it (the mistake of a sensor address swapped between
 * rooms; common practice, no published source). Checked only on benches that
 * declare rooms: without them every device models a room of its own by design.
 */
export const gatewayExternalSensorElsewhereRule: BenchCheckRule = {
  id: "room.external-sensor-elsewhere",
  severity: "warning",
  title: "A unit controls on a room temperature measured in another room",
  check(view) {
    if ((view.bench.rooms ?? []).length === 0) return [];
    const findings: CheckFinding[] = [];
    for (const [id, entry] of view.devices) {
      if (entry.device.type !== "hvac-gateway") continue;
      if (entry.parameters.roomTemperatureSource !== "external") continue;
      const sensors = sendersTo(view, id, EXTERNAL_ROOM_TEMPERATURE_OBJECT);
      for (const unit of unitsOf(view, id)) {
        const unitRoom = view.devices.get(unit)?.device.room;
        for (const sensor of sensors) {
          const sensorRoom = view.devices.get(sensor)?.device.room;
          if (sensorRoom === unitRoom) continue;
          findings.push({
            rule: this.id,
            severity: this.severity,
            message: `${entry.device.name} (${id}) controls ${unit} (${roomName(view, unitRoom)}) on the room temperature from ${sensor} (${roomName(view, sensorRoom)}): the unit heats or cools one room while it reads another`,
            location: { device: id, object: EXTERNAL_ROOM_TEMPERATURE_OBJECT },
          });
        }
      }
    }
    return findings;
  },
};

/** Device types that read a room's temperature, and so model one of their own when given none. */
const ROOM_READERS = new Set(["indoor-unit", "room-temperature-sensor"]);

/**
 * On a bench that declares rooms, a unit or room sensor left out of every room
 * models a room of its own, which nothing else reads or heats: what it reports
 * drifts away from the room it was meant to be in.
 */
export const deviceWithoutRoomRule: BenchCheckRule = {
  id: "room.device-without-room",
  severity: "warning",
  title: "A unit or room sensor is in none of the bench's rooms",
  check(view) {
    if ((view.bench.rooms ?? []).length === 0) return [];
    const findings: CheckFinding[] = [];
    for (const [id, entry] of view.devices) {
      if (!ROOM_READERS.has(entry.device.type) || entry.device.room !== undefined) continue;
      if (entry.parameters.source === "profile") continue; // a sensor playing a profile reads no room
      findings.push({
        rule: this.id,
        severity: this.severity,
        message: `${entry.device.name} (${id}) is in none of the bench's rooms, so it models a room of its own that no other device reads or heats`,
        location: { device: id },
      });
    }
    return findings;
  },
};
