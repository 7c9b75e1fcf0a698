/**
 * Why a bench could not be loaded. Every error names where it is: `path` is a
 * JSON path into the document ("devices[2].individualAddress"), and the
 * device, object or group address at fault is repeated in its own field so the
 * editor can highlight it.
 */
export interface BenchError {
  readonly kind:
    | "bench.not-an-object"
    | "bench.format-missing"
    | "bench.format-unsupported"
    | "bench.schema"
    | "bench.address-invalid"
    | "bench.duplicate-id"
    | "bench.duplicate-individual-address"
    | "bench.duplicate-group-address"
    | "bench.device-type-unknown"
    | "bench.parameters-invalid"
    | "bench.individual-address-missing"
    | "bench.individual-address-unexpected"
    | "bench.line-unknown"
    | "bench.dpt-unknown"
    | "bench.object-unknown"
    | "bench.link-device-unknown"
    | "bench.link-address-unknown"
    | "bench.link-duplicate"
    | "bench.address-size-mismatch"
    | "bench.unit-link-member-unknown"
    /** A coupler's individual address is not a.l.0 (line coupler) or a.0.0 (area coupler). */
    | "bench.coupler-address"
    /** A line a coupler joins (its own line or the line above) is not on the bench. */
    | "bench.coupler-line-missing";
  readonly path: string;
  readonly message: string;
  readonly deviceId?: string;
  readonly object?: number;
  /** Group address as written in the bench. */
  readonly groupAddress?: string;
}
