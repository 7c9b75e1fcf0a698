import { registerDeviceType } from "../catalogue";
import { outdoorUnitType } from "./outdoor-unit";

registerDeviceType(outdoorUnitType);

export {
  outdoorUnitParametersSchema,
  outdoorUnitType,
  type OutdoorUnitParameters,
  type OutdoorUnitState,
} from "./outdoor-unit";
