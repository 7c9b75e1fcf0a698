import type { z } from "zod";

/**
 * A device type's parameter schema as a tree of form fields, read from the zod
 * 4 schema itself (`schema.def`), so a new device type gets its parameter
 * panel without any UI code: enums become selects, booleans checkboxes,
 * numbers number inputs, nested objects fieldsets, arrays of objects repeated
 * fieldsets.
 */
export type ParameterField =
  | {
      readonly kind: "enum";
      readonly name: string;
      readonly options: readonly string[];
      readonly defaultValue?: unknown;
    }
  | { readonly kind: "boolean"; readonly name: string; readonly defaultValue?: unknown }
  | {
      readonly kind: "number";
      readonly name: string;
      readonly min?: number;
      readonly max?: number;
      readonly integer: boolean;
      readonly defaultValue?: unknown;
    }
  | { readonly kind: "string"; readonly name: string; readonly defaultValue?: unknown }
  | {
      readonly kind: "object";
      readonly name: string;
      readonly fields: readonly ParameterField[];
      readonly defaultValue?: unknown;
    }
  | {
      readonly kind: "array";
      readonly name: string;
      readonly element: ParameterField;
      readonly minItems?: number;
      readonly maxItems?: number;
      readonly defaultValue?: unknown;
    }
  | { readonly kind: "unsupported"; readonly name: string; readonly defaultValue?: unknown };

// The slice of zod 4's internal definition that the walk reads.
interface Def {
  readonly type: string;
  readonly innerType?: z.ZodType;
  readonly in?: z.ZodType;
  readonly shape?: Record<string, z.ZodType>;
  readonly entries?: Record<string, string | number>;
  readonly values?: readonly unknown[];
  readonly element?: z.ZodType;
  readonly defaultValue?: unknown;
  readonly checks?: readonly {
    readonly _zod: {
      readonly def: {
        readonly check: string;
        readonly minimum?: number;
        readonly maximum?: number;
      };
    };
  }[];
}

function defOf(schema: z.ZodType): Def {
  return (schema as unknown as { def: Def }).def;
}

function lengthBounds(def: Def): { minItems?: number; maxItems?: number } {
  const bounds: { minItems?: number; maxItems?: number } = {};
  for (const check of def.checks ?? []) {
    const c = check._zod.def;
    if (c.check === "min_length" && c.minimum !== undefined) bounds.minItems = c.minimum;
    if (c.check === "max_length" && c.maximum !== undefined) bounds.maxItems = c.maximum;
  }
  return bounds;
}

/** Converts one schema into a field named `name` (a dotted path usable by react-hook-form). */
export function parameterField(schema: z.ZodType, name: string): ParameterField {
  let current = schema;
  let defaultValue: unknown = undefined;
  // Unwrap defaults, prefaults, optionals and pipes down to the value's own type.
  for (let depth = 0; depth < 8; depth++) {
    const def = defOf(current);
    if ((def.type === "default" || def.type === "prefault") && def.innerType) {
      if (defaultValue === undefined)
        defaultValue =
          typeof def.defaultValue === "function"
            ? (def.defaultValue as () => unknown)()
            : def.defaultValue;
      current = def.innerType;
    } else if (
      (def.type === "optional" || def.type === "nullable" || def.type === "readonly") &&
      def.innerType
    ) {
      current = def.innerType;
    } else if (def.type === "pipe" && def.in) {
      current = def.in;
    } else break;
  }
  const def = defOf(current);
  const withDefault = defaultValue === undefined ? {} : { defaultValue };
  switch (def.type) {
    case "enum":
      return {
        kind: "enum",
        name,
        options: Object.values(def.entries ?? {}).map(String),
        ...withDefault,
      };
    case "literal":
      return { kind: "enum", name, options: (def.values ?? []).map(String), ...withDefault };
    case "boolean":
      return { kind: "boolean", name, ...withDefault };
    case "number": {
      const bag = current as unknown as {
        minValue: number | null;
        maxValue: number | null;
        isInt: boolean;
      };
      return {
        kind: "number",
        name,
        integer: bag.isInt === true,
        ...(Number.isFinite(bag.minValue) ? { min: bag.minValue! } : {}),
        ...(Number.isFinite(bag.maxValue) ? { max: bag.maxValue! } : {}),
        ...withDefault,
      };
    }
    case "string":
      return { kind: "string", name, ...withDefault };
    case "object":
      return {
        kind: "object",
        name,
        fields: Object.entries(def.shape ?? {}).map(([key, child]) =>
          parameterField(child, name === "" ? key : `${name}.${key}`),
        ),
        ...withDefault,
      };
    case "array":
      return {
        kind: "array",
        name,
        element: parameterField(def.element!, `${name}.*`),
        ...lengthBounds(def),
        ...withDefault,
      };
    default:
      return { kind: "unsupported", name, ...withDefault };
  }
}

/** The top-level fields of a device type's parameter schema. */
export function parameterFields(schema: z.ZodType): readonly ParameterField[] {
  const root = parameterField(schema, "");
  return root.kind === "object" ? root.fields : [];
}

/** The last segment of a field's dotted name: "roomTemperatureSending.deltaK" -> "deltaK". */
export function fieldKey(field: ParameterField): string {
  return field.name.split(".").at(-1) ?? field.name;
}

/** "setpointMinC" -> "Setpoint min °C": readable labels from parameter names with their unit suffixes. */
export function fieldLabel(key: string): string {
  const units: readonly [RegExp, string][] = [
    [/C$/, " (°C)"],
    [/K$/, " (K)"],
    [/S$/, " (s)"],
    [/Us$/, " (µs)"],
    [/Percent$/, " (%)"],
  ];
  let unit = "";
  let base = key;
  for (const [pattern, text] of units) {
    if (pattern.test(key) && /[a-z]/.test(key.slice(0, -1))) {
      base = key.replace(pattern, "");
      unit = text;
      break;
    }
  }
  const words = base.replace(/([a-z0-9])([A-Z])/g, "$1 $2").toLowerCase();
  return words.charAt(0).toUpperCase() + words.slice(1) + unit;
}

/** A value for a new array element: the element's defaults, or the lowest allowed number where there is none. */
export function emptyValue(field: ParameterField): unknown {
  if (field.defaultValue !== undefined) return structuredClone(field.defaultValue);
  switch (field.kind) {
    case "enum":
      return field.options[0];
    case "boolean":
      return false;
    case "number":
      return field.min ?? 0;
    case "string":
      return "";
    case "object":
      return Object.fromEntries(field.fields.map((f) => [fieldKey(f), emptyValue(f)]));
    case "array":
      return [];
    case "unsupported":
      return undefined;
  }
}
