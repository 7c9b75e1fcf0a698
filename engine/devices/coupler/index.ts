import { registerDeviceType } from "../catalogue";
import { couplerType } from "./coupler";

registerDeviceType(couplerType);

export {
  COUPLER_TYPE_ID,
  DEFAULT_COUPLER_QUEUE_CAPACITY,
  couplerParametersSchema,
  couplerType,
  type CouplerParameters,
} from "./coupler";
