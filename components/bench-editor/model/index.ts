/**
 * The bench editor's model: pure functions from an engine bench document to
 * the next one. The canvas, the panels and the store only call these, so every
 * edit is testable without React and the document stays engine bench JSON.
 */
export { refuse, type EditRefusal, type EditResult } from "./edit-refusal";
export { deviceObjects, effectiveParameters, type EditorObject } from "./device-objects";
export { groupAddressKey, normalGroupAddress, sameGroupAddress } from "./group-address-key";
export {
  lineHighByte,
  nextIndividualAddress,
  takenIndividualAddresses,
} from "./individual-addresses";
export {
  addDevice,
  freshDeviceId,
  removeDevices,
  renameDevice,
  setIndividualAddress,
  setDeviceRoom,
  setObjectFlags,
  setParameters,
  type AddDeviceInput,
  type SetParametersOutcome,
} from "./devices";
export {
  connectObject,
  disconnectObject,
  sendingLinks,
  setSendingAddress,
  type LinkTarget,
} from "./links";
export {
  addGroupAddress,
  deleteGroupAddresses,
  nextFreeGroupAddress,
  renameGroupAddress,
  renumberGroupAddress,
  setGroupAddressDpt,
  type AddGroupAddressInput,
} from "./group-addresses";
export { joinUnitLink, joinsUnitLinks, leaveUnitLink } from "./unit-links";
export { moveNodes, type NodeMove, type NodeRef } from "./move-nodes";
export { copyDevices, pasteDevices, type DeviceClipboard } from "./clipboard";
export { summarizeChanges } from "./summarize-changes";
export {
  addRoom,
  deleteRoom,
  devicesInRoom,
  freshRoomId,
  renameRoom,
  setRoomThermal,
  type RoomThermalField,
} from "./rooms";
