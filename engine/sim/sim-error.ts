/** Why the simulation refused a request from outside (console, scenario, CLI). The message names the field. */
export interface SimError {
  readonly kind:
    | "sim.device-unknown"
    | "sim.device-not-on-line"
    | "sim.group-address-invalid"
    | "sim.group-address-unknown"
    | "sim.value-invalid"
    | "sim.button-unknown"
    | "sim.object-unknown"
    | "sim.fault-target-unknown"
    | "sim.fault-unknown"
    | "sim.parameters-invalid";
  /** The argument at fault: "deviceId", "groupAddress", "value", "button", "faultId", "parameters.<key>"… */
  readonly field: string;
  readonly message: string;
}
