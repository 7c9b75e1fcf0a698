import { getDpt, HVAC_CONTROLLER_MODES, HVAC_MODES } from "@/engine";

/** Which editor the control pad shows for a DPT. */
export type ValueEditorKind =
  | { readonly kind: "switch"; readonly offLabel: string; readonly onLabel: string }
  | { readonly kind: "percent" }
  | {
      readonly kind: "number";
      readonly min: number;
      readonly max: number;
      readonly step: number;
      readonly unit: string;
    }
  | { readonly kind: "mode"; readonly options: readonly { value: number; label: string }[] }
  | { readonly kind: "scene" }
  | { readonly kind: "scene-control" }
  | { readonly kind: "text"; readonly maxLength: number }
  | { readonly kind: "json" };

/** Picks the editor made for a DPT: a switch for 1.x, a slider for 5.001, a mode list for 20.x, and so on. */
export function editorFor(dpt: string): ValueEditorKind {
  const codec = getDpt(dpt);
  if (codec === undefined) return { kind: "json" };
  const main = dpt.split(".")[0];
  if (main === "1")
    return { kind: "switch", offLabel: codec.format(false), onLabel: codec.format(true) };
  if (dpt === "5.001") return { kind: "percent" };
  if (dpt === "17.001") return { kind: "scene" };
  if (dpt === "18.001") return { kind: "scene-control" };
  if (dpt === "20.105" || dpt === "20.102") {
    const table = dpt === "20.105" ? HVAC_CONTROLLER_MODES : HVAC_MODES;
    return {
      kind: "mode",
      options: Object.entries(table).map(([value, label]) => ({ value: Number(value), label })),
    };
  }
  // DPT spec §3 (16.000/16.001): 14 octets of text.
  if (main === "16") return { kind: "text", maxLength: 14 };
  if (codec.min !== undefined && codec.max !== undefined) {
    const integer = ["5", "6", "7", "8", "12", "13"].includes(main ?? "");
    return {
      kind: "number",
      min: codec.min,
      max: codec.max,
      step: integer ? 1 : main === "9" ? 0.1 : 0.01,
      unit: codec.unit,
    };
  }
  return { kind: "json" };
}

/** A sensible first value for a DPT's editor (and for a flood). */
export function defaultDptValue(dpt: string): unknown {
  const editor = editorFor(dpt);
  switch (editor.kind) {
    case "switch":
      return true;
    case "percent":
      return 50;
    case "number":
      return dpt.startsWith("9.") && editor.min <= 21 && editor.max >= 21
        ? 21
        : Math.max(editor.min, Math.min(editor.max, 0));
    case "mode":
      return editor.options[0]?.value ?? 0;
    case "scene":
      return 1;
    case "scene-control":
      return { learn: false, scene: 1 };
    case "text":
      return "";
    case "json":
      return null;
  }
}

/** Checks a value against the DPT's schema; the message names what is wrong. */
export function checkDptValue(
  dpt: string,
  value: unknown,
): { ok: true } | { ok: false; message: string } {
  const codec = getDpt(dpt);
  if (codec === undefined) return { ok: false, message: `unknown DPT ${dpt}` };
  const parsed = codec.valueSchema.safeParse(value);
  if (parsed.success) return { ok: true };
  return {
    ok: false,
    message: `${dpt}: ${parsed.error.issues[0]?.message ?? "not a value of this DPT"}`,
  };
}
