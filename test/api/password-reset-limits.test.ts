import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  admitPasswordResetRequest,
  passwordResetLimitedMessage,
  passwordResetLimits,
  signInLimits,
} from "@/app/_lib/auth";
import { getDb } from "@/db/client";
import { emailOutbox } from "@/db/schema";
import { call, createWorld, destroyWorld, testPassword, type World } from "./support/world";

let world: World;
beforeAll(() => {
  world = createWorld();
  // Per-address limits count the X-Forwarded-For address only behind a trusted proxy.
  process.env.TRUSTED_PROXY = "127.0.0.1";
});
afterAll(() => {
  delete process.env.TRUSTED_PROXY;
  destroyWorld(world);
});

async function requestReset(email: string, address: string) {
  const { POST } = await import("@/app/api/session/password-reset/route");
  return call(POST, {
    method: "POST",
    path: "/api/session/password-reset",
    body: { email },
    headers: { "x-forwarded-for": address },
  });
}

async function signIn(email: string, password: string, address: string) {
  const { POST } = await import("@/app/api/session/route");
  return call(POST, {
    method: "POST",
    path: "/api/session",
    body: { email, password },
    headers: { "x-forwarded-for": address },
  });
}

function resetMailsTo(email: string): number {
  return getDb()
    .select()
    .from(emailOutbox)
    .where(and(eq(emailOutbox.toAddress, email), eq(emailOutbox.purpose, "password-reset")))
    .all().length;
}

describe("password-reset request limits", () => {
  it(`refuses the request after ${passwordResetLimits.requestsPerEmail} for one e-mail address, alike with and without an account`, async () => {
    const answers: Record<string, { status: number; body: string }[]> = {};
    for (const email of ["qa@a.example", "nobody-here@a.example"]) {
      answers[email] = [];
      for (let i = 0; i <= passwordResetLimits.requestsPerEmail; i++) {
        // A new client address each time, so only the per-e-mail limit can engage.
        const response = await requestReset(email, `198.51.100.${i}`);
        answers[email].push({ status: response.status, body: await response.text() });
      }
    }
    const known = answers["qa@a.example"]!;
    const unknown = answers["nobody-here@a.example"]!;
    // Both see the very same sequence of answers: nothing tells the account exists.
    expect(unknown).toEqual(known);
    expect(known.map((answer) => answer.status)).toEqual([
      ...Array.from({ length: passwordResetLimits.requestsPerEmail }, () => 202),
      429,
    ]);
    const limited = JSON.parse(known.at(-1)!.body) as { error: { code: string; message: string } };
    expect(limited.error).toMatchObject({
      code: "rate_limited",
      message: passwordResetLimitedMessage,
    });
    // Only the admitted requests sent mail.
    expect(resetMailsTo("qa@a.example")).toBe(passwordResetLimits.requestsPerEmail);
    // Capitals and spaces name the same address, so they do not get round the limit.
    expect((await requestReset("  QA@A.example", "198.51.100.99")).status).toBe(429);
  });

  it(`refuses a client address after ${passwordResetLimits.requestsPerAddress} requests across e-mail addresses`, async () => {
    for (let i = 0; i < passwordResetLimits.requestsPerAddress; i++) {
      expect((await requestReset(`someone-${i}@a.example`, "192.0.2.50")).status).toBe(202);
    }
    const limited = await requestReset("engineer@a.example", "192.0.2.50");
    expect(limited.status).toBe(429);
    expect(((await limited.json()) as { error: { code: string } }).error.code).toBe("rate_limited");
    expect(resetMailsTo("engineer@a.example")).toBe(0);
    // Another address is still served.
    expect((await requestReset("engineer@a.example", "192.0.2.51")).status).toBe(202);
    expect(resetMailsTo("engineer@a.example")).toBe(1);
  });

  it("admits requests again once the window has passed", () => {
    const start = new Date("2031-03-01T08:00:00Z");
    const email = "window@a.example";
    for (let i = 0; i < passwordResetLimits.requestsPerEmail; i++) {
      admitPasswordResetRequest({ email, clientAddress: `203.0.113.${i}`, now: start });
    }
    expect(() =>
      admitPasswordResetRequest({ email, clientAddress: "203.0.113.90", now: start }),
    ).toThrow(passwordResetLimitedMessage);
    const later = new Date(start.getTime() + passwordResetLimits.windowMs + 1000);
    expect(() =>
      admitPasswordResetRequest({ email, clientAddress: "203.0.113.91", now: later }),
    ).not.toThrow();
  });

  it("keeps reset requests and sign-in failures apart", async () => {
    // Reset requests up to the limit do not count as failed sign-ins...
    for (let i = 0; i < passwordResetLimits.requestsPerEmail; i++) {
      expect((await requestReset("trainer@a.example", `192.0.2.${60 + i}`)).status).toBe(202);
    }
    expect((await signIn("trainer@a.example", testPassword, "192.0.2.70")).status).toBe(200);
    // ...and failed sign-ins up to theirs do not use up reset requests.
    for (let i = 0; i < signInLimits.failuresPerAccount; i++) {
      expect(
        (await signIn("apprentice@a.example", "wrong-password", `192.0.2.${80 + i}`)).status,
      ).toBe(401);
    }
    expect((await requestReset("apprentice@a.example", "192.0.2.90")).status).toBe(202);
  });
});
