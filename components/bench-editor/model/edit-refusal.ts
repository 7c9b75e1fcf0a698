import { err, type Result } from "@/engine";
import type { Bench } from "@/engine";

/**
 * Why the editor refused an edit. Refusals are expected (a person dragged a
 * 1-bit port onto a 2-byte bus-bar), so they travel as values; `field` names
 * what was wrong so the panel or canvas can point at it.
 */
export interface EditRefusal {
  readonly kind:
    | "edit.device-unknown"
    | "edit.device-type-unknown"
    | "edit.object-unknown"
    | "edit.line-unknown"
    | "edit.line-full"
    | "edit.address-invalid"
    | "edit.address-taken"
    | "edit.address-unknown"
    | "edit.dpt-unknown"
    | "edit.size-mismatch"
    | "edit.link-exists"
    | "edit.link-unknown"
    | "edit.parameters-invalid"
    | "edit.name-empty"
    | "edit.unit-link-invalid"
    | "edit.room-unknown"
    | "edit.line-invalid"
    | "edit.line-exists"
    | "edit.coupler-invalid"
    | "edit.room-invalid";
  readonly message: string;
  /** Field at fault, e.g. "parameters.fanLevels", "individualAddress", "address". */
  readonly field?: string;
}

/** The bench after an edit, or why the edit was refused. */
export type EditResult<T = Bench> = Result<T, EditRefusal>;

export function refuse(kind: EditRefusal["kind"], message: string, field?: string) {
  return err<EditRefusal>(field === undefined ? { kind, message } : { kind, message, field });
}
