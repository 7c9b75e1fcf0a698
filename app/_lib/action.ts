import { unstable_rethrow } from "next/navigation";
import type { z } from "zod";
import type { ActionState } from "./action-state";
import { toAppError, validationError } from "./errors";

export { type ActionState, idleActionState } from "./action-state";

/** Form fields as a plain object; repeated names become arrays, files are dropped. */
export function formDataObject(formData: FormData): Record<string, string | string[]> {
  const out: Record<string, string | string[]> = {};
  for (const [key, value] of formData.entries()) {
    // React adds its own $ACTION_* fields to progressively enhanced forms.
    if (key.startsWith("$ACTION")) continue;
    if (typeof value !== "string") continue;
    const existing = out[key];
    if (existing === undefined) out[key] = value;
    else out[key] = Array.isArray(existing) ? [...existing, value] : [existing, value];
  }
  return out;
}

/**
 * A server action for `useActionState`: form data is validated with the
 * (strict) schema, then the handler runs. The handler checks the session and
 * role itself through dal.ts (verifySession / authorize), in that order.
 * AppErrors (and known database errors) come back as an error state; Next's
 * redirect and not-found signals pass through; anything else is logged and
 * reported as a generic server error.
 */
export function validatedAction<S extends z.ZodType, T>(
  schema: S,
  handler: (input: z.infer<S>) => Promise<T>,
): (previous: ActionState<T>, formData: FormData) => Promise<ActionState<T>> {
  return async (_previous, formData) => {
    const parsed = schema.safeParse(formDataObject(formData));
    if (!parsed.success) return { status: "error", ...validationError(parsed.error).toBody() };
    try {
      return { status: "ok", data: await handler(parsed.data) };
    } catch (error) {
      unstable_rethrow(error);
      return { status: "error", ...toAppError(error).toBody() };
    }
  };
}
