/** Calls `visit` for every object inside a parameter tree, with its dotted path ("channels.0"). */
export function walkParameterObjects(
  value: unknown,
  visit: (object: Record<string, unknown>, path: string) => void,
  path = "",
): void {
  if (Array.isArray(value)) {
    value.forEach((item, index) =>
      walkParameterObjects(item, visit, path ? `${path}.${index}` : String(index)),
    );
    return;
  }
  if (value === null || typeof value !== "object") return;
  const object = value as Record<string, unknown>;
  visit(object, path);
  for (const [key, child] of Object.entries(object)) {
    walkParameterObjects(child, visit, path ? `${path}.${key}` : key);
  }
}

/** Joins a parent path and a key the way `walkParameterObjects` does. */
export function childPath(path: string, key: string): string {
  return path ? `${path}.${key}` : key;
}
