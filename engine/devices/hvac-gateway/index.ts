import { registerDeviceType } from "../catalogue";
import { hvacGatewayType } from "./hvac-gateway";

registerDeviceType(hvacGatewayType);

export { hvacGatewayType } from "./hvac-gateway";
export { gatewayObjects } from "./objects";
export {
  hvacGatewayParametersSchema,
  sceneSlotSchema,
  type HvacGatewayParameters,
  type SceneSlot,
} from "./parameters";
export type { HvacGatewayState } from "./state";
