export {
  NO_DRIVE,
  equilibriumC,
  roomBalance,
  secondsToReach,
  temperatureAfterC,
  timeConstantS,
  type RoomBalance,
  type RoomDrive,
  type RoomSpec,
  type RoomThermalSpec,
} from "./lumped-room";
export * from "./room-constants";
