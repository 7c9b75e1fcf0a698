import { flags, type GroupObjectSpec } from "../device-type";
import { FAN_DPT } from "./fan-speed";
import type { HvacGatewayParameters } from "./parameters";

/** Group object numbers of the HVAC gateway; stable whatever the parameters, absent when disabled. */
export const gatewayObjects = {
  power: 0,
  powerStatus: 1,
  setpoint: 2,
  setpointStatus: 3,
  mode: 4,
  modeStatus: 5,
  heatCool: 6,
  heatCoolStatus: 7,
  fan: 8,
  fanStatus: 9,
  louvre: 10,
  louvreStatus: 11,
  roomTemperature: 12,
  externalRoomTemperature: 13,
  scene: 14,
  sceneControl: 15,
  windowContact: 16,
  lock: 17,
  fault: 18,
  faultText: 19,
  modeAuthority: 20,
  modeConflict: 21,
  fanAuto: 22,
  fanAutoStatus: 23,
  setpointShift: 24,
  setpointShiftStatus: 25,
  outdoorTemperature: 26,
  localLock: 27,
  localLockStatus: 28,
  filterAlarm: 29,
  filterReset: 30,
  frostProtection: 31,
  operatingMode: 32,
  operatingModeStatus: 33,
  presence: 34,
  fanHeld: 35,
} as const;

const O = gatewayObjects;

function command(number: number, name: string, dpt: string): GroupObjectSpec {
  return { number, name, dpt, flags: flags("CW"), role: "command" };
}

function status(number: number, name: string, dpt: string): GroupObjectSpec {
  return { number, name, dpt, flags: flags("CRT"), role: "status" };
}

function input(number: number, name: string, dpt: string): GroupObjectSpec {
  // Update and read-on-init: take a sensor's answer to the start-up read as well as its writes.
  return { number, name, dpt, flags: flags("CWUI"), role: "input" };
}

/** The gateway's objects for these parameters, in number order. */
export function gatewayGroupObjects(p: HvacGatewayParameters): GroupObjectSpec[] {
  const objects: GroupObjectSpec[] = [
    command(O.power, "Power", "1.001"),
    status(O.powerStatus, "Power status", "1.001"),
    command(O.setpoint, "Setpoint", "9.001"),
    status(O.setpointStatus, "Setpoint status", "9.001"),
  ];
  if (p.modeControl === "full")
    objects.push(command(O.mode, "Mode", "20.105"), status(O.modeStatus, "Mode status", "20.105"));
  else
    objects.push(
      command(O.heatCool, "Heat/cool", "1.100"),
      status(O.heatCoolStatus, "Heat/cool status", "1.100"),
    );
  objects.push(
    command(O.fan, p.fanEncoding === "percent" ? "Fan speed" : "Fan level", FAN_DPT[p.fanEncoding]),
    status(
      O.fanStatus,
      p.fanEncoding === "percent" ? "Fan speed status" : "Fan level status",
      FAN_DPT[p.fanEncoding],
    ),
  );
  if (p.setpointShift !== "off") {
    const dpt = p.setpointShift === "kelvin" ? "9.002" : "6.010";
    objects.push(
      command(O.setpointShift, "Setpoint shift", dpt),
      status(O.setpointShiftStatus, "Setpoint shift status", dpt),
    );
  }
  if (p.fanAutoObject)
    objects.push(
      command(O.fanAuto, "Automatic fan", "1.001"),
      status(O.fanAutoStatus, "Automatic fan status", "1.001"),
    );
  if (p.louvre)
    objects.push(
      command(O.louvre, "Louvre position", "5.001"),
      status(O.louvreStatus, "Louvre position status", "5.001"),
    );
  objects.push(status(O.roomTemperature, "Room temperature", "9.001"));
  if (p.outdoorTemperature)
    objects.push(status(O.outdoorTemperature, "Outdoor temperature", "9.001"));
  if (p.roomTemperatureSource === "external")
    objects.push(input(O.externalRoomTemperature, "External room temperature", "9.001"));
  if (p.scenes.length > 0)
    objects.push(
      command(O.scene, "Scene", "17.001"),
      command(O.sceneControl, "Scene control", "18.001"),
    );
  if (p.windowContact) objects.push(input(O.windowContact, "Window contact", "1.019"));
  if (p.lock) objects.push(command(O.lock, "Lock", "1.001"));
  if (p.operatingMode)
    objects.push(
      input(O.operatingMode, "Operating mode", "20.102"),
      status(O.operatingModeStatus, "Operating mode status", "20.102"),
      input(O.presence, "Presence", "1.018"),
    );
  if (p.fanHeldStatus) objects.push(status(O.fanHeld, "Defrost / hot start", "1.002"));
  if (p.frostProtectionStatus)
    objects.push(status(O.frostProtection, "Frost protection active", "1.002"));
  if (p.filterAlarm)
    objects.push(
      status(O.filterAlarm, "Filter alarm", "1.005"),
      command(O.filterReset, "Filter reset", "1.015"),
    );
  if (p.localLock)
    objects.push(
      command(O.localLock, "Local operation lock", "1.001"),
      status(O.localLockStatus, "Local operation lock status", "1.001"),
    );
  objects.push(status(O.fault, "Fault", "1.005"), status(O.faultText, "Fault text", "16.000"));
  if (p.systemType === "multi-split")
    objects.push(
      status(O.modeAuthority, "Mode authority", "1.002"),
      status(O.modeConflict, "Mode conflict", "1.002"),
    );
  return objects;
}
