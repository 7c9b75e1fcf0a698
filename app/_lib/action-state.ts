import type { AppErrorBody } from "./errors";

/**
 * What a server action built with `validatedAction` returns to the form
 * (`useActionState`): the handler's data, or the same error body the JSON API
 * uses, naming the field at fault. `idle` is the state before the first submit.
 * Kept apart from action.ts so client components can import it.
 */
export type ActionState<T> =
  | { readonly status: "idle" }
  | { readonly status: "ok"; readonly data: T }
  | ({ readonly status: "error" } & AppErrorBody);

export const idleActionState = { status: "idle" } as const;
