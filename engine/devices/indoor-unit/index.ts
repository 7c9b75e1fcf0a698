import { registerDeviceType } from "../catalogue";
import { indoorUnitType } from "./indoor-unit";

registerDeviceType(indoorUnitType);

export { indoorUnitType } from "./indoor-unit";
export { indoorUnitParametersSchema, type IndoorUnitParameters } from "./parameters";
export type { IndoorUnitState } from "./state";
