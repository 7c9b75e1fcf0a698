import { sealData } from "iron-session";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { sealSession, unsealSession, type SessionPayload } from "./session";
import { sealExpiration, sessionCacheCapacity, sessionCacheSize } from "./session-cache";

/**
 * The cache of unsealed cookies may only save work: every cookie it answers
 * for must be one unsealData would still accept, under the same secret and
 * within the same expiry. (Ending sessions by version, removal and role is the
 * database check's job; test/api/sessions.test.ts covers those through the routes.)
 */
const secret = "a-session-cache-test-secret-long-enough-0123456789";
const payload = (issuedAt = Date.now()): SessionPayload => ({
  userId: "user-1",
  workspaceId: "workspace-1",
  sessionVersion: 0,
  issuedAt,
});

beforeEach(() => {
  process.env.SESSION_SECRET = secret;
  process.env.SESSION_TTL_SECONDS = String(8 * 60 * 60);
});
afterEach(() => {
  vi.useRealTimers();
  delete process.env.SESSION_SECRET;
  delete process.env.SESSION_TTL_SECONDS;
});

describe("session cookie cache", () => {
  it("answers a cookie opened before with the same payload", async () => {
    const value = await sealSession(payload());
    const first = await unsealSession(value);
    const size = sessionCacheSize();
    const again = await unsealSession(value);
    expect(again).toEqual(first);
    expect(sessionCacheSize()).toBe(size);
  });

  it("keeps no forged or tampered cookie", async () => {
    const value = await sealSession(payload());
    const before = sessionCacheSize();
    const tampered = value.slice(0, -2) + (value.endsWith("AA") ? "BB" : "AA");
    expect(await unsealSession(tampered)).toBeNull();
    expect(await unsealSession("Fe26.2**not*a*real*seal*at*all~2")).toBeNull();
    expect(sessionCacheSize()).toBe(before);
  });

  it("refuses a remembered cookie once its seal has expired, as iron would", async () => {
    vi.useFakeTimers();
    // A seal of one minute whose sign-in time alone would still be valid for hours.
    const value = await sealData(payload(), { password: secret, ttl: 60 });
    expect(sealExpiration(value)).toBeGreaterThan(Date.now());
    expect(await unsealSession(value)).not.toBeNull();
    // iron allows 60 s of clock skew past the expiry.
    vi.advanceTimersByTime(60_000 + 60_000 + 1_000);
    expect(await unsealSession(value)).toBeNull();
  });

  it("refuses a remembered cookie once the sign-in is older than the session lifetime", async () => {
    vi.useFakeTimers();
    const value = await sealSession(payload());
    expect(await unsealSession(value)).not.toBeNull();
    vi.advanceTimersByTime(8 * 60 * 60 * 1000 + 1_000);
    expect(await unsealSession(value)).toBeNull();
  });

  it("forgets every cookie when the secret changes", async () => {
    const value = await sealSession(payload());
    expect(await unsealSession(value)).not.toBeNull();
    process.env.SESSION_SECRET = "another-secret-for-the-cache-test-0123456789abcdef";
    expect(await unsealSession(value)).toBeNull();
  });

  it("holds at most its capacity of cookies", async () => {
    const now = Date.now();
    for (let i = 0; i < sessionCacheCapacity + 5; i += 1) {
      expect(await unsealSession(await sealSession(payload(now - i)))).not.toBeNull();
    }
    expect(sessionCacheSize()).toBe(sessionCacheCapacity);
  });
});
