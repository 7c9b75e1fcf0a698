import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { sealData } from "iron-session";
import {
  signInFailedMessage,
  signInLimits,
  signInWithPassword,
  unknownAddressDelayMs,
} from "@/app/_lib/auth";
import { setUserDisabled } from "@/db/queries/users";
import {
  call,
  cookieFor,
  cookieFromResponse,
  createWorld,
  destroyWorld,
  testPassword,
  type World,
} from "./support/world";

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
afterEach(() => {
  vi.useRealTimers();
});

const sessionRoute = () => import("@/app/api/session/route");

async function whoAmI(cookie: string | undefined) {
  const { GET } = await sessionRoute();
  return call(GET, { method: "GET", path: "/api/session", ...(cookie ? { cookie } : {}) });
}

async function signIn(email: string, password: string, address = "192.0.2.10") {
  const { POST } = await sessionRoute();
  return call(POST, {
    method: "POST",
    path: "/api/session",
    body: { email, password },
    headers: { "x-forwarded-for": address },
  });
}

describe("sign-in", () => {
  it("signs in with e-mail and password and sets an httpOnly, sameSite=lax cookie", async () => {
    const response = await signIn("QA@a.example ", testPassword);
    expect(response.status).toBe(200);
    const setCookie = response.headers.get("set-cookie")!;
    expect(setCookie).toMatch(/HttpOnly/);
    expect(setCookie).toMatch(/SameSite=Lax/);
    expect(setCookie).not.toMatch(/Secure/); // SESSION_COOKIE_SECURE=false in this test world
    const me = await whoAmI(cookieFromResponse(response));
    expect(me.status).toBe(200);
    const body = (await me.json()) as { user: { email: string }; workspace: { role: string } };
    expect(body.user.email).toBe("qa@a.example");
    expect(body.workspace.role).toBe("qa");
  });

  it("gives the same generic 401 for a wrong password and an unknown account", async () => {
    const wrong = await signIn("engineer@a.example", "not-the-password", "192.0.2.11");
    const unknown = await signIn("nobody@a.example", "not-the-password", "192.0.2.11");
    for (const response of [wrong, unknown]) {
      expect(response.status).toBe(401);
      expect(response.headers.get("set-cookie")).toBeNull();
      expect(((await response.json()) as { error: { message: string } }).error.message).toBe(
        signInFailedMessage,
      );
    }
  });

  it("refuses a disabled account with the same message", async () => {
    setUserDisabled({ userId: world.users.trainer.userId, disabled: true });
    const response = await signIn("trainer@a.example", testPassword, "192.0.2.12");
    expect(response.status).toBe(401);
    expect(((await response.json()) as { error: { message: string } }).error.message).toBe(
      signInFailedMessage,
    );
    setUserDisabled({ userId: world.users.trainer.userId, disabled: false });
  });
});

describe("rate limiting", () => {
  it(`refuses one address after ${signInLimits.failuresPerAccount} failures on an account, even for the right password, while the owner still signs in from elsewhere`, async () => {
    // Someone who knows the address tries to lock its owner out.
    for (let i = 0; i < signInLimits.failuresPerAccount; i++) {
      expect((await signIn(world.outsider.email, "wrong-password", "198.51.100.66")).status).toBe(
        401,
      );
    }
    const limited = await signIn(world.outsider.email, testPassword, "198.51.100.66");
    expect(limited.status).toBe(429);
    expect(((await limited.json()) as { error: { code: string } }).error.code).toBe("rate_limited");
    // The owner, from another address, is not locked out.
    expect((await signIn(world.outsider.email, testPassword, "198.51.100.67")).status).toBe(200);
  });

  it("does not hold back an address while its failures on an account stay under the limit", async () => {
    for (let i = 0; i < signInLimits.failuresPerAccount - 1; i++) {
      expect((await signIn("apprentice@a.example", "wrong-password", "203.0.113.5")).status).toBe(
        401,
      );
    }
    expect((await signIn("apprentice@a.example", testPassword, "203.0.113.5")).status).toBe(200);
    // The success reset the count of that pair.
    for (let i = 0; i < signInLimits.failuresPerAccount; i++) {
      expect((await signIn("apprentice@a.example", "wrong-password", "203.0.113.5")).status).toBe(
        401,
      );
    }
    expect((await signIn("apprentice@a.example", "wrong-password", "203.0.113.5")).status).toBe(
      429,
    );
  });

  it(`limits one address after ${signInLimits.failuresPerAddress} failures across accounts`, async () => {
    for (let i = 0; i < signInLimits.failuresPerAddress; i++) {
      expect((await signIn(`guess-${i}@a.example`, "wrong-password", "192.0.2.99")).status).toBe(
        401,
      );
    }
    const limited = await signIn("admin@a.example", testPassword, "192.0.2.99");
    expect(limited.status).toBe(429);
    // Another address is still served.
    expect((await signIn("admin@a.example", testPassword, "192.0.2.100")).status).toBe(200);
  });
});

describe("rate limiting when the client address is unknown (no trusted proxy)", () => {
  it("slows attempts on an account down after a failure streak instead of refusing them: 1 s doubling to 16 s", () => {
    const atLimit = signInLimits.failuresPerAccount;
    expect(unknownAddressDelayMs(atLimit - 1)).toBe(0);
    expect(unknownAddressDelayMs(atLimit)).toBe(1_000);
    expect(unknownAddressDelayMs(atLimit + 1)).toBe(2_000);
    expect(unknownAddressDelayMs(atLimit + 4)).toBe(16_000);
    expect(unknownAddressDelayMs(atLimit + 500)).toBe(16_000);
  });

  it("lets the owner sign in with the right password after someone else's failures, only later", async () => {
    const waits: number[] = [];
    const wait = async (ms: number) => {
      waits.push(ms);
    };
    const attempt = (password: string) =>
      signInWithPassword({ email: world.users.qa.email, password, clientAddress: null, wait });
    for (let i = 0; i < signInLimits.failuresPerAccount + 2; i++) {
      await expect(attempt("wrong-password")).rejects.toMatchObject({
        code: "invalid_credentials",
      });
    }
    // Before this change the sixth attempt was refused with 429 whatever the password.
    const payload = await attempt(testPassword);
    expect(payload.userId).toBe(world.users.qa.userId);
    expect(waits).toEqual([1_000, 2_000, 4_000]);
  });
});

describe("cookies", () => {
  it("rejects a missing, tampered, foreign or malformed cookie with 401", async () => {
    const good = await cookieFor(world.users.engineer.userId, world.a.workspaceId);
    expect((await whoAmI(good)).status).toBe(200);
    const [name, value] = good.split("=") as [string, string];
    const raw = decodeURIComponent(value);
    const flipped = raw.slice(0, 40) + (raw[40] === "A" ? "B" : "A") + raw.slice(41);
    const foreign = await sealData(
      {
        userId: world.users.admin.userId,
        workspaceId: world.a.workspaceId,
        sessionVersion: 0,
        issuedAt: Date.now(),
      },
      { password: "a-different-secret-that-is-long-enough-9876543210" },
    );
    for (const cookie of [
      undefined,
      `${name}=${encodeURIComponent(flipped)}`,
      `${name}=${encodeURIComponent(foreign)}`,
      `${name}=garbage`,
    ]) {
      const response = await whoAmI(cookie);
      expect(response.status).toBe(401);
      expect(((await response.json()) as { error: { code: string } }).error.code).toBe(
        "unauthenticated",
      );
    }
  });

  it("rejects an expired cookie", async () => {
    const cookie = await cookieFor(world.users.engineer.userId, world.a.workspaceId);
    // Eight hours (the default lifetime) and a minute later.
    vi.useFakeTimers({ now: Date.now() + (8 * 60 * 60 + 60) * 1000, toFake: ["Date"] });
    expect((await whoAmI(cookie)).status).toBe(401);
  });

  it("ends every copy of a session on sign-out", async () => {
    const signedIn = await signIn("engineer@a.example", testPassword, "192.0.2.50");
    const cookie = cookieFromResponse(signedIn);
    const otherTab = await cookieFor(world.users.engineer.userId, world.a.workspaceId);
    const { DELETE } = await sessionRoute();
    const out = await call(DELETE, { method: "DELETE", path: "/api/session", cookie });
    expect(out.status).toBe(204);
    expect(out.headers.get("set-cookie")).toMatch(/Max-Age=0/);
    expect((await whoAmI(cookie)).status).toBe(401);
    expect((await whoAmI(otherTab)).status).toBe(401);
  });

  it("ends the sessions of a member removed from the workspace, and of a disabled account", async () => {
    const qaCookie = await cookieFor(world.users.qa.userId, world.a.workspaceId);
    const admin = await cookieFor(world.users.admin.userId, world.a.workspaceId);
    const members = await import("@/app/api/members/route");
    const list = (await (
      await call(members.GET, { method: "GET", path: "/api/members", cookie: admin })
    ).json()) as {
      members: { membershipId: string; userId: string }[];
    };
    const qa = list.members.find((m) => m.userId === world.users.qa.userId)!;
    const member = await import("@/app/api/members/[membershipId]/route");
    const removed = await call(member.DELETE, {
      method: "DELETE",
      path: "/api/x",
      params: { membershipId: qa.membershipId },
      cookie: admin,
    });
    expect(removed.status).toBe(204);
    expect((await whoAmI(qaCookie)).status).toBe(401);

    const trainerCookie = await cookieFor(world.users.trainer.userId, world.a.workspaceId);
    setUserDisabled({ userId: world.users.trainer.userId, disabled: true });
    expect((await whoAmI(trainerCookie)).status).toBe(401);
    setUserDisabled({ userId: world.users.trainer.userId, disabled: false });
  });

  it("keeps the last admin: demoting or removing them is a 409", async () => {
    const admin = await cookieFor(world.users.admin.userId, world.a.workspaceId);
    const members = await import("@/app/api/members/route");
    const list = (await (
      await call(members.GET, { method: "GET", path: "/api/members", cookie: admin })
    ).json()) as {
      members: { membershipId: string; role: string }[];
    };
    const self = list.members.find((m) => m.role === "admin")!;
    const member = await import("@/app/api/members/[membershipId]/route");
    const demoted = await call(member.PATCH, {
      method: "PATCH",
      path: "/api/x",
      params: { membershipId: self.membershipId },
      cookie: admin,
      body: { role: "qa" },
    });
    expect(demoted.status).toBe(409);
  });

  it("switches workspace only to one the user belongs to", async () => {
    const cookie = await cookieFor(world.users.admin.userId, world.a.workspaceId);
    const { PATCH } = await sessionRoute();
    const response = await call(PATCH, {
      method: "PATCH",
      path: "/api/session",
      cookie,
      body: { workspaceId: world.b.workspaceId },
    });
    expect(response.status).toBe(404);
  });
});
