import { registerDeviceType } from "../catalogue";
import { presenceDetectorType } from "./presence-detector";

registerDeviceType(presenceDetectorType);

export {
  presenceDetectorParametersSchema,
  presenceDetectorType,
  presenceObjects,
  type PresenceDetectorParameters,
  type PresenceDetectorState,
} from "./presence-detector";
