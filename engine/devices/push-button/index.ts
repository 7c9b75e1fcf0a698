import { registerDeviceType } from "../catalogue";
import { pushButtonType } from "./push-button";

registerDeviceType(pushButtonType);

export {
  pushButtonType,
  pushButtonParametersSchema,
  type PushButtonParameters,
  type PushButtonState,
} from "./push-button";
