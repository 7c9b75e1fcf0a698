/**
 * Built-in device types. Importing this module registers each of them in the
 * catalogue; add one import line per new type (each type lives in
 * engine/devices/<type-id>/ and registers itself from its index.ts).
 */
import "./push-button";
import "./switch-actuator";
import "./hvac-gateway";
import "./indoor-unit";
import "./outdoor-unit";
import "./wall-controller";
import "./room-temperature-sensor";
import "./presence-detector";
import "./binary-input";
import "./control-panel";
import "./coupler";

export { getDeviceType, listDeviceTypes, registerDeviceType } from "./catalogue";
export * from "./device-type";
export { pushButtonType, type PushButtonParameters, type PushButtonState } from "./push-button";
export {
  switchActuatorType,
  statusObject,
  switchObject,
  type SwitchActuatorParameters,
  type SwitchActuatorState,
} from "./switch-actuator";
export {
  hvacGatewayType,
  gatewayObjects,
  type HvacGatewayParameters,
  type HvacGatewayState,
} from "./hvac-gateway";
export { indoorUnitType, type IndoorUnitParameters, type IndoorUnitState } from "./indoor-unit";
export { outdoorUnitType, type OutdoorUnitParameters, type OutdoorUnitState } from "./outdoor-unit";
export {
  wallControllerType,
  type WallControllerParameters,
  type WallControllerState,
} from "./wall-controller";
export {
  roomTemperatureSensorType,
  ROOM_TEMPERATURE_OBJECT,
  type RoomTemperatureSensorParameters,
} from "./room-temperature-sensor";
export {
  presenceDetectorType,
  presenceObjects,
  type PresenceDetectorParameters,
} from "./presence-detector";
export { binaryInputType, BINARY_INPUT_OBJECT, type BinaryInputParameters } from "./binary-input";
export {
  controlPanelType,
  controlPanelButtonId,
  type ControlPanelParameters,
  type ControlPanelTile,
} from "./control-panel";
export {
  COUPLER_TYPE_ID,
  DEFAULT_COUPLER_QUEUE_CAPACITY,
  couplerType,
  type CouplerParameters,
} from "./coupler";
