/**
 * Built-in device types. Importing this module registers each of them in the
 * catalogue; add one import line per new type (each type lives in
 * engine/devices/<type-id>/ and registers itself from its index.ts).
 */
import "./push-button";
import "./switch-actuator";

export { getDeviceType, listDeviceTypes, registerDeviceType } from "./catalogue";
export * from "./device-type";
export { pushButtonType, type PushButtonParameters, type PushButtonState } from "./push-button";
export { switchActuatorType, statusObject, switchObject, type SwitchActuatorParameters, type SwitchActuatorState } from "./switch-actuator";
