import { registerDeviceType } from "../catalogue";
import { switchActuatorType } from "./switch-actuator";

registerDeviceType(switchActuatorType);

export {
  switchActuatorType,
  switchActuatorParametersSchema,
  statusObject,
  switchObject,
  type SwitchActuatorParameters,
  type SwitchActuatorState,
} from "./switch-actuator";
