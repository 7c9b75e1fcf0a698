/** The API's error body (app/_lib/errors.ts). */
export interface ApiErrorBody {
  readonly error: { readonly code: string; readonly message: string; readonly field?: string };
}

export type PostResult<T> =
  | { readonly ok: true; readonly data: T }
  | { readonly ok: false; readonly error: ApiErrorBody["error"] };

/** Send JSON to one of the app's routes and return its data or its error body. */
export async function sendJson<T>(
  url: string,
  method: "POST" | "PATCH" | "PUT" | "DELETE",
  body?: unknown,
): Promise<PostResult<T>> {
  let response: Response;
  try {
    response = await fetch(url, {
      method,
      headers: body === undefined ? {} : { "Content-Type": "application/json" },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
  } catch {
    return { ok: false, error: { code: "network", message: "the server could not be reached" } };
  }
  const text = await response.text();
  const data: unknown = text ? JSON.parse(text) : null;
  if (!response.ok) {
    const error = (data as ApiErrorBody | null)?.error;
    return {
      ok: false,
      error: error ?? { code: "internal", message: `the server answered ${response.status}` },
    };
  }
  return { ok: true, data: data as T };
}
