/**
 * Fetch helpers for TanStack Query in the studio's client components. A failed
 * response becomes an ApiError carrying the API's error body, so pages can
 * show its message (and the query client can skip retrying 4xx answers).
 */
export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly field: string | undefined;
  constructor(status: number, code: string, message: string, field?: string) {
    // The status leads the message so the query client's retry rule can see it.
    super(`${status} ${message}`);
    this.name = "ApiError";
    this.status = status;
    this.code = code;
    this.field = field;
  }
  /** The API's own message, without the status. */
  get detail(): string {
    return this.message.replace(/^\d{3} /, "");
  }
}

async function parse<T>(response: Response): Promise<T> {
  const text = await response.text();
  const data: unknown = text ? JSON.parse(text) : null;
  if (!response.ok) {
    const error = (data as { error?: { code: string; message: string; field?: string } } | null)
      ?.error;
    throw new ApiError(
      response.status,
      error?.code ?? "internal",
      error?.message ?? `the server answered ${response.status}`,
      error?.field,
    );
  }
  return data as T;
}

export async function getJson<T>(url: string): Promise<T> {
  return parse<T>(await fetch(url, { headers: { Accept: "application/json" } }));
}

export async function sendJson<T>(
  url: string,
  method: "POST" | "PATCH" | "PUT" | "DELETE",
  body?: unknown,
): Promise<T> {
  return parse<T>(
    await fetch(url, {
      method,
      headers: body === undefined ? {} : { "Content-Type": "application/json" },
      body: body === undefined ? undefined : JSON.stringify(body),
    }),
  );
}

export function errorText(error: unknown): string {
  return error instanceof ApiError ? error.detail : "something went wrong";
}
