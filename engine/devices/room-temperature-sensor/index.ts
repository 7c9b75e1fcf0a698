import { registerDeviceType } from "../catalogue";
import { roomTemperatureSensorType } from "./room-temperature-sensor";

registerDeviceType(roomTemperatureSensorType);

export {
  roomTemperatureSensorParametersSchema,
  type RoomTemperatureSensorParameters,
} from "./parameters";
export {
  ROOM_TEMPERATURE_OBJECT,
  profileValueC,
  roomTemperatureSensorType,
  type RoomTemperatureSensorState,
} from "./room-temperature-sensor";
