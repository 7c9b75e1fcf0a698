import { registerDeviceType } from "../catalogue";
import { controlPanelType } from "./control-panel";

registerDeviceType(controlPanelType);

export {
  controlPanelButtonId,
  controlPanelParametersSchema,
  controlPanelTileSchema,
  controlPanelType,
  isCommandTile,
  type ControlPanelParameters,
  type ControlPanelState,
  type ControlPanelTile,
} from "./control-panel";
