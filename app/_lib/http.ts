import type { z } from "zod";
import { reachedOriginOf } from "./client-address";
import { AppError, errorResponse, validationError } from "./errors";
import { jsonShapeProblem } from "./json-shape";

/**
 * Guards every JSON route handler goes through: an Origin check for anything
 * that is not GET/HEAD/OPTIONS (cross-site request forgery), a JSON content
 * type, a body-size limit, JSON parsing and a strict zod schema. Used through
 * `route()` and `readJson()`; errors become JSON through the one mapper.
 */

const safeMethods = new Set(["GET", "HEAD", "OPTIONS"]);

/** Default request-body limit for small JSON bodies (member, invitation, run ...). */
export const defaultBodyLimitBytes = 64 * 1024;
/** Limit for routes that carry a whole bench or scenario document. */
export const documentBodyLimitBytes = 1024 * 1024;

/** Origins this request may come from: APP_URL and the app as this request reached it. */
function ownOrigins(request: Request): Set<string> {
  const origins = new Set<string>();
  const configured = process.env.APP_URL?.trim();
  if (configured) {
    try {
      origins.add(new URL(configured).origin);
    } catch {
      // reported by appUrl() where it is needed
    }
  }
  origins.add(new URL(request.url).origin);
  // Forwarded host and protocol count only from a trusted proxy (client-address.ts).
  const reached = reachedOriginOf(request);
  if (reached) origins.add(reached);
  return origins;
}

/**
 * Refuse a state-changing request whose Origin is missing or not the app's
 * own. Browsers send Origin on every non-GET fetch and form post, so a missing
 * one means a non-browser client or an old browser, refused alike.
 */
export function checkOrigin(request: Request): void {
  if (safeMethods.has(request.method)) return;
  const origin = request.headers.get("origin");
  if (!origin || origin === "null") {
    throw new AppError("bad_origin", "requests that change data must carry the app's Origin");
  }
  if (!ownOrigins(request).has(origin)) {
    throw new AppError("bad_origin", `requests from ${origin} are not accepted`);
  }
}

/** A request's declared media type and charset, lower-cased ("" when absent). */
export function contentTypeOf(request: Request): { type: string; charset: string | null } {
  const [type = "", ...parameters] = (request.headers.get("content-type") ?? "").split(";");
  let charset: string | null = null;
  for (const parameter of parameters) {
    const [name, value] = parameter.split("=");
    if (name?.trim().toLowerCase() === "charset")
      charset = (value ?? "").trim().replace(/^"|"$/g, "").toLowerCase();
  }
  return { type: type.trim().toLowerCase(), charset };
}

/**
 * Refuse a text body declared in a charset other than UTF-8: it would
 * otherwise be decoded as UTF-8 and mean something other than what was sent.
 */
export function checkUtf8Charset(request: Request): void {
  const { charset } = contentTypeOf(request);
  if (charset !== null && charset !== "utf-8" && charset !== "utf8") {
    throw new AppError(
      "unsupported_media_type",
      `send the body as UTF-8 (got charset "${charset.slice(0, 40)}")`,
      { field: "(body)" },
    );
  }
}

/** Refuse a body that is not declared as JSON in UTF-8. */
export function checkJsonContentType(request: Request): void {
  const { type } = contentTypeOf(request);
  if (type !== "application/json") {
    throw new AppError(
      "unsupported_media_type",
      `send the body as application/json (got ${type ? `"${type.slice(0, 80)}"` : "no content type"})`,
    );
  }
  checkUtf8Charset(request);
}

/**
 * The one reader of request bodies: streams the body and stops as soon as it
 * passes the limit (a chunked body without Content-Length included), so no
 * request makes the server hold more than the limit plus one chunk. Routes
 * call it only after the session and role are checked.
 */
export async function readBodyBytes(
  request: Request,
  limitBytes: number,
  options: { field?: string; tooLarge?: string } = {},
): Promise<Uint8Array> {
  const tooLarge = () =>
    new AppError(
      "body_too_large",
      options.tooLarge ?? `the request body is larger than ${limitBytes} bytes`,
      options.field === undefined ? undefined : { field: options.field },
    );
  const declared = request.headers.get("content-length");
  if (declared !== null && Number(declared) > limitBytes) throw tooLarge();
  if (!request.body) return new Uint8Array(0);
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limitBytes) {
      await reader.cancel().catch(() => undefined);
      throw tooLarge();
    }
    chunks.push(value);
  }
  const bytes = new Uint8Array(total);
  let offset = 0;
  for (const chunk of chunks) {
    bytes.set(chunk, offset);
    offset += chunk.byteLength;
  }
  return bytes;
}

/** Read the body as UTF-8 text, stopping as soon as it passes the limit. */
export async function readBodyText(request: Request, limitBytes: number): Promise<string> {
  const bytes = await readBodyBytes(request, limitBytes);
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    throw new AppError("invalid_json", "the request body is not valid UTF-8");
  }
}

/**
 * Parse a JSON request body with a (strict) zod schema: content type and
 * charset, size, nesting depth and duplicate keys, JSON syntax, then shape. Every failure is a
 * 4xx AppError naming the field. Call it after the session and role checks.
 */
export async function readJson<S extends z.ZodType>(
  request: Request,
  schema: S,
  options: { limitBytes?: number } = {},
): Promise<z.infer<S>> {
  checkJsonContentType(request);
  const text = await readBodyText(request, options.limitBytes ?? defaultBodyLimitBytes);
  // Checked on the text, before anything recursive (JSON.parse, zod, the
  // engine's loaders) walks the value.
  const shape = jsonShapeProblem(text);
  if (shape) throw new AppError("invalid_input", shape.message, { field: shape.field });
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch (error) {
    throw new AppError(
      "invalid_json",
      `the request body is not valid JSON: ${(error as Error).message}`,
      { field: "(body)" },
    );
  }
  const parsed = schema.safeParse(data);
  if (!parsed.success) throw validationError(parsed.error);
  return parsed.data;
}

/** Parse query parameters with a zod schema; failures name the parameter. */
export function readQuery<S extends z.ZodType>(request: Request, schema: S): z.infer<S> {
  const params = Object.fromEntries(new URL(request.url).searchParams);
  const parsed = schema.safeParse(params);
  if (!parsed.success) throw validationError(parsed.error);
  return parsed.data;
}

/** A JSON response that is never cached. */
export function json(data: unknown, init: { status?: number; headers?: HeadersInit } = {}) {
  const headers = new Headers(init.headers);
  headers.set("Cache-Control", "no-store");
  return Response.json(data, { status: init.status ?? 200, headers });
}

/**
 * The policy of every API response: data, never a document, so opened in a
 * tab it runs and loads nothing. A route that serves a file sets its own
 * (the floor plan); next.config.ts gives Next's own /api answers the same.
 */
export const apiContentSecurityPolicy = "default-src 'none'; sandbox";

function withApiPolicy(response: Response): Response {
  if (response.headers.has("content-security-policy")) return response;
  try {
    response.headers.set("Content-Security-Policy", apiContentSecurityPolicy);
    return response;
  } catch {
    // Immutable headers (a redirect): copy into a response we may change.
    const headers = new Headers(response.headers);
    headers.set("Content-Security-Policy", apiContentSecurityPolicy);
    return new Response(response.body, { status: response.status, headers });
  }
}

/**
 * Wrap a route handler: the Origin check runs first for non-GET methods,
 * anything thrown is answered through the one error mapper, and every answer
 * carries the API's Content-Security-Policy unless the route set its own.
 */
export function route<Context>(
  handler: (request: Request, context: Context) => Promise<Response> | Response,
): (request: Request, context: Context) => Promise<Response> {
  return async (request, context) => {
    try {
      checkOrigin(request);
      return withApiPolicy(await handler(request, context));
    } catch (error) {
      return withApiPolicy(errorResponse(error));
    }
  };
}

/** Route params as Next 16 passes them (a promise). */
export interface RouteParams<P extends Record<string, string>> {
  readonly params: Promise<P>;
}
