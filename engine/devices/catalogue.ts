import type { AnyDeviceType } from "./device-type";

/**
 * The catalogue of device types, by id. Built-in types register themselves when
 * engine/devices/index.ts is imported (one import line per type); tests and
 * benchmarks may register extra types of their own.
 */
const types = new Map<string, AnyDeviceType>();

/** Adds a type. Registering a second, different type under an existing id is a bug and throws. */
export function registerDeviceType(type: AnyDeviceType): void {
  const existing = types.get(type.id);
  if (existing !== undefined && existing !== type) {
    throw new Error(
      `registerDeviceType: a different device type is already registered as "${type.id}"`,
    );
  }
  if (!/^[a-z][a-z0-9]*(?:-[a-z0-9]+)*$/.test(type.id)) {
    throw new Error(`registerDeviceType: id "${type.id}" is not kebab-case`);
  }
  types.set(type.id, type);
}

/** The type registered under `id`, or undefined. */
export function getDeviceType(id: string): AnyDeviceType | undefined {
  return types.get(id);
}

/** Every registered type, sorted by id so lists are stable. */
export function listDeviceTypes(): readonly AnyDeviceType[] {
  return [...types.values()].sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
}
