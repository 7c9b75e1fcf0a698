import { registerDeviceType } from "../catalogue";
import { binaryInputType } from "./binary-input";

registerDeviceType(binaryInputType);

export {
  BINARY_INPUT_OBJECT,
  binaryInputParametersSchema,
  binaryInputType,
  type BinaryInputParameters,
  type BinaryInputState,
} from "./binary-input";
