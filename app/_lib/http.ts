import type { z } from "zod";
import { AppError, errorResponse, validationError } from "./errors";

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
  const url = new URL(request.url);
  origins.add(url.origin);
  // Behind a reverse proxy the browser's origin is the proxy's host.
  const host = request.headers.get("x-forwarded-host") ?? request.headers.get("host");
  if (host) {
    const proto =
      request.headers.get("x-forwarded-proto")?.split(",")[0]?.trim() ||
      url.protocol.replace(":", "");
    origins.add(`${proto}://${host.split(",")[0]!.trim()}`);
  }
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

/** Refuse a body that is not declared as JSON. */
export function checkJsonContentType(request: Request): void {
  const type = request.headers.get("content-type")?.split(";")[0]?.trim().toLowerCase();
  if (type !== "application/json") {
    throw new AppError(
      "unsupported_media_type",
      `send the body as application/json (got ${type ? `"${type}"` : "no content type"})`,
    );
  }
}

/** Read the body as text, stopping as soon as it passes the limit. */
export async function readBodyText(request: Request, limitBytes: number): Promise<string> {
  const tooLarge = () =>
    new AppError("body_too_large", `the request body is larger than ${limitBytes} bytes`);
  const declared = request.headers.get("content-length");
  if (declared !== null && Number(declared) > limitBytes) throw tooLarge();
  if (!request.body) return "";
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
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    throw new AppError("invalid_json", "the request body is not valid UTF-8");
  }
}

/**
 * Parse a JSON request body with a (strict) zod schema: content type, size,
 * JSON syntax, then shape. Every failure is a 400-class AppError naming the field.
 */
export async function readJson<S extends z.ZodType>(
  request: Request,
  schema: S,
  options: { limitBytes?: number } = {},
): Promise<z.infer<S>> {
  checkJsonContentType(request);
  const text = await readBodyText(request, options.limitBytes ?? defaultBodyLimitBytes);
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
 * Wrap a route handler: the Origin check runs first for non-GET methods, and
 * anything thrown is answered through the one error mapper.
 */
export function route<Context>(
  handler: (request: Request, context: Context) => Promise<Response> | Response,
): (request: Request, context: Context) => Promise<Response> {
  return async (request, context) => {
    try {
      checkOrigin(request);
      return await handler(request, context);
    } catch (error) {
      return errorResponse(error);
    }
  };
}

/** Route params as Next 16 passes them (a promise). */
export interface RouteParams<P extends Record<string, string>> {
  readonly params: Promise<P>;
}
