import { registerDeviceType } from "../catalogue";
import { wallControllerType } from "./wall-controller";

registerDeviceType(wallControllerType);

export { wallControllerParametersSchema, type WallControllerParameters } from "./parameters";
export { wallControllerType, type WallControllerState } from "./wall-controller";
