import { sealData, unsealData } from "iron-session";
import { z } from "zod";
import { sessionCookieConfig, sessionSecret } from "./config";
import {
  cachedSeal,
  forgetSeal,
  rememberSeal,
  sealClockSkewMs,
  sealExpiration,
} from "./session-cache";

/**
 * The session cookie: iron-session's sealed (encrypted and authenticated)
 * payload. Only identifiers live in it; role, name and the validity of the
 * session are read from the database on every request (see dal.ts), so a role
 * change, removal or disabled account takes effect at once.
 *
 * This module only seals, unseals and formats the cookie. It reads the cookie
 * either from a `Request` (route handlers: testable without Next's request
 * context) or from `next/headers` (server components and actions).
 */
export const sessionPayloadSchema = z
  .object({
    userId: z.string().min(1),
    /** The active workspace; switching workspaces rewrites the cookie. */
    workspaceId: z.string().min(1),
    /** Must equal users.session_version, or the session has been ended. */
    sessionVersion: z.number().int().nonnegative(),
    /** Milliseconds since the epoch when the user signed in. */
    issuedAt: z.number().int().nonnegative(),
  })
  .strict();
export type SessionPayload = z.infer<typeof sessionPayloadSchema>;

/** Seal a payload into a cookie value. */
export async function sealSession(payload: SessionPayload): Promise<string> {
  const { ttlSeconds } = sessionCookieConfig();
  return sealData(payload, { password: sessionSecret(), ttl: ttlSeconds });
}

/**
 * Open a cookie value. Tampered, foreign-key, malformed and expired values all
 * give null: iron-session checks the MAC and its own expiry, and the sign-in
 * time is checked against the configured lifetime as well, so shortening
 * SESSION_TTL_SECONDS also ends older sessions.
 *
 * A value that opened before is taken from session-cache.ts instead of being
 * decrypted again; both expiry checks still run on every call.
 */
export async function unsealSession(
  value: string | undefined,
  now: number = Date.now(),
): Promise<SessionPayload | null> {
  if (!value) return null;
  const { ttlSeconds } = sessionCookieConfig();
  // Outside the try: a missing secret is a configuration error, not a bad cookie.
  const password = sessionSecret();
  let payload: SessionPayload;
  const cached = cachedSeal<SessionPayload>(password, value);
  if (cached) {
    // iron's own expiry test, as unsealData would make it.
    if (cached.sealExpiresAt !== null && cached.sealExpiresAt <= Date.now() - sealClockSkewMs) {
      forgetSeal(password, value);
      return null;
    }
    payload = cached.payload;
  } else {
    let data: unknown;
    try {
      data = await unsealData<unknown>(value, { password, ttl: ttlSeconds });
    } catch {
      return null;
    }
    const parsed = sessionPayloadSchema.safeParse(data);
    if (!parsed.success) return null;
    payload = Object.freeze(parsed.data);
    rememberSeal(password, value, { payload, sealExpiresAt: sealExpiration(value) });
  }
  const ageMs = now - payload.issuedAt;
  if (ageMs < 0 || ageMs > ttlSeconds * 1000) return null;
  return payload;
}

/** The value of one cookie in a Cookie request header. */
export function cookieFromHeader(header: string | null, name: string): string | undefined {
  if (!header) return undefined;
  for (const part of header.split(";")) {
    const eq = part.indexOf("=");
    if (eq < 0) continue;
    if (part.slice(0, eq).trim() === name) {
      const raw = part.slice(eq + 1).trim();
      try {
        return decodeURIComponent(raw);
      } catch {
        return raw;
      }
    }
  }
  return undefined;
}

/** The session cookie's raw value from a request (route handlers, proxy, tests). */
export function sessionCookieFromRequest(request: Request): string | undefined {
  return cookieFromHeader(request.headers.get("cookie"), sessionCookieConfig().name);
}

/** Attributes shared by setting and clearing the cookie. */
export function sessionCookieAttributes(maxAgeSeconds: number) {
  const { secure } = sessionCookieConfig();
  return {
    httpOnly: true,
    sameSite: "lax" as const,
    secure,
    path: "/",
    maxAge: maxAgeSeconds,
  };
}

function setCookieString(name: string, value: string, maxAgeSeconds: number): string {
  const attributes = sessionCookieAttributes(maxAgeSeconds);
  return [
    `${name}=${encodeURIComponent(value)}`,
    `Path=${attributes.path}`,
    `Max-Age=${attributes.maxAge}`,
    "HttpOnly",
    "SameSite=Lax",
    ...(attributes.secure ? ["Secure"] : []),
  ].join("; ");
}

/** A Set-Cookie header value carrying a new session (route handlers). */
export async function sessionSetCookie(payload: SessionPayload): Promise<string> {
  const { name, ttlSeconds } = sessionCookieConfig();
  // The cookie ends a minute before the seal does, as iron-session does itself.
  return setCookieString(name, await sealSession(payload), Math.max(ttlSeconds - 60, 60));
}

/** A Set-Cookie header value that removes the session cookie. */
export function clearedSessionSetCookie(): string {
  return setCookieString(sessionCookieConfig().name, "", 0);
}

/** Read the session cookie in a server component or action. */
export async function readSessionCookie(): Promise<string | undefined> {
  const { cookies } = await import("next/headers");
  return (await cookies()).get(sessionCookieConfig().name)?.value;
}

/** Write the session cookie from a server action. */
export async function writeSessionCookie(payload: SessionPayload): Promise<void> {
  const { cookies } = await import("next/headers");
  const { name, ttlSeconds } = sessionCookieConfig();
  const value = await sealSession(payload);
  (await cookies()).set(name, value, sessionCookieAttributes(Math.max(ttlSeconds - 60, 60)));
}

/** Remove the session cookie from a server action. */
export async function deleteSessionCookie(): Promise<void> {
  const { cookies } = await import("next/headers");
  const { name } = sessionCookieConfig();
  (await cookies()).set(name, "", sessionCookieAttributes(0));
}
