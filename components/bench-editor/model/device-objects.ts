import type { BenchDevice } from "@/engine";
import { getDeviceType } from "@/engine";
import type { AnyDeviceType, GroupObjectSpec } from "@/engine";
import { dptSizeBits } from "@/engine";

/** A group object as the editor shows it: the type's spec with the bench's flag overrides. */
export interface EditorObject extends GroupObjectSpec {
  /** Size of the object's value in bits, from its DPT. */
  readonly sizeBits: number;
}

/**
 * The device's parameters with the type's defaults filled, or the defaults
 * alone when the written ones do not parse (the checks report that).
 */
export function effectiveParameters(
  type: AnyDeviceType,
  written: Record<string, unknown>,
): unknown {
  const parsed = type.parameters.safeParse(written);
  if (parsed.success) return parsed.data;
  return type.parameters.parse({});
}

/** The group objects a bench device has for its parameters; empty for an unknown type. */
export function deviceObjects(device: BenchDevice): readonly EditorObject[] {
  const type = getDeviceType(device.type);
  if (type === undefined) return [];
  const specs = type.groupObjects(effectiveParameters(type, device.parameters));
  return specs.map((spec) => ({
    ...spec,
    flags: { ...spec.flags, ...device.objectFlags?.[String(spec.number)] },
    sizeBits: dptSizeBits(spec.dpt) ?? 0,
  }));
}
