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
    | "sim.parameters-invalid"
    | "sim.input-invalid";
  /** The argument at fault: the `SimInput` field ("device", "groupAddress", "value", "button", "fault") or, for a refused parameter change, the bench path of the first problem */
  readonly field: string;
  readonly message: string;
  /** Every problem the bench check found, for a refused parameter change (the first one is `field`). */
  readonly issues?: readonly { readonly path?: string; readonly message: string }[];
}
