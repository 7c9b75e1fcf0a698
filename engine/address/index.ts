export type { AddressError } from "./address-error";
export {
  parseGroupAddress,
  formatGroupAddress,
  isGroupAddressRaw,
  MAX_RAW_ADDRESS,
  type GroupAddressStyle,
} from "./group-address";
export {
  parseIndividualAddress,
  formatIndividualAddress,
  UNPROGRAMMED_INDIVIDUAL_ADDRESS,
} from "./individual-address";
export { groupAddressTextSchema, individualAddressTextSchema } from "./address-schemas";
