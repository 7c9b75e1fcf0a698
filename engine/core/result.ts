/**
 * Expected failures travel as values, never as exceptions: a parse error, an
 * out-of-range value or a refused request is a `Result` with `ok: false`.
 * Bugs (broken invariants) still throw.
 */
export type Result<T, E> =
  { readonly ok: true; readonly value: T } | { readonly ok: false; readonly error: E };

export function ok<T>(value: T): { readonly ok: true; readonly value: T } {
  return { ok: true, value };
}

export function err<E>(error: E): { readonly ok: false; readonly error: E } {
  return { ok: false, error };
}
