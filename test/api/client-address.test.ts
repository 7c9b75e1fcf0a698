import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { clientAddressOf, reachedOriginOf } from "@/app/_lib/client-address";
import { ConfigError } from "@/app/_lib/config";
import { getDb } from "@/db/client";
import { call, createWorld, destroyWorld, type World } from "./support/world";

/**
 * X-Forwarded-For, -Host and -Proto are whatever the client sends unless a
 * reverse proxy in front sets them, so they count only when TRUSTED_PROXY
 * names that proxy. Without it the per-address sign-in limit has no address
 * to go by (each account keeps its own limit) and the Origin check goes by the
 * Host header alone.
 */

let world: World;
beforeAll(() => {
  world = createWorld();
});
afterAll(() => destroyWorld(world));
afterEach(() => {
  delete process.env.TRUSTED_PROXY;
});

function request(headers: Record<string, string>) {
  return new Request("http://127.0.0.1:3000/api/session", { method: "POST", headers });
}

describe("clientAddressOf", () => {
  it("without a trusted proxy: unknown, whatever X-Forwarded-For says", () => {
    expect(clientAddressOf(request({ "x-forwarded-for": "198.51.100.7" }))).toBeNull();
    expect(clientAddressOf(request({ "x-real-ip": "198.51.100.7" }))).toBeNull();
    expect(clientAddressOf(request({}))).toBeNull();
  });

  it("behind trusted proxies: the right-most entry that is not one of them", () => {
    process.env.TRUSTED_PROXY = "127.0.0.1, 10.0.0.5";
    expect(clientAddressOf(request({ "x-forwarded-for": "198.51.100.7" }))).toBe("198.51.100.7");
    // A client's own forged entries sit to the left of what the proxy appended.
    expect(
      clientAddressOf(request({ "x-forwarded-for": "203.0.113.66, 198.51.100.7, 10.0.0.5" })),
    ).toBe("198.51.100.7");
    expect(clientAddressOf(request({}))).toBeNull();
  });

  it("refuses a TRUSTED_PROXY that is not a list of IP addresses", () => {
    process.env.TRUSTED_PROXY = "proxy.internal";
    expect(() => clientAddressOf(request({}))).toThrow(ConfigError);
  });
});

describe("reachedOriginOf", () => {
  it("without a trusted proxy: the Host header, never X-Forwarded-Host", () => {
    const forged = request({ host: "bench.test", "x-forwarded-host": "elsewhere.example" });
    expect(reachedOriginOf(forged)).toBe("http://bench.test");
  });

  it("behind a trusted proxy: X-Forwarded-Host and -Proto", () => {
    process.env.TRUSTED_PROXY = "127.0.0.1";
    const proxied = request({
      host: "127.0.0.1:3000",
      "x-forwarded-host": "bench.example",
      "x-forwarded-proto": "https",
    });
    expect(reachedOriginOf(proxied)).toBe("https://bench.example");
  });
});

async function signInAttempt(headers: Record<string, string>, origin?: string) {
  const { POST } = await import("@/app/api/session/route");
  return call(POST, {
    method: "POST",
    path: "/api/session",
    body: { email: "admin@a.example", password: "not-the-password" },
    headers,
    ...(origin === undefined ? {} : { origin }),
  });
}

function lastRecordedAddress(): string | null {
  const row = getDb()
    .$client.prepare("select client_address from login_attempts order by rowid desc limit 1")
    .get() as { client_address: string | null };
  return row.client_address;
}

describe("sign-in and the Origin check", () => {
  it("without a trusted proxy a forged X-Forwarded-For does not choose the address counted", async () => {
    expect((await signInAttempt({ "x-forwarded-for": "198.51.100.7" })).status).toBe(401);
    expect(lastRecordedAddress()).toBeNull();
  });

  it("behind a trusted proxy the proxy's X-Forwarded-For entry is counted", async () => {
    process.env.TRUSTED_PROXY = "127.0.0.1";
    expect((await signInAttempt({ "x-forwarded-for": "203.0.113.66, 198.51.100.7" })).status).toBe(
      401,
    );
    expect(lastRecordedAddress()).toBe("198.51.100.7");
  });

  it("a forged X-Forwarded-Host does not make another origin the app's own", async () => {
    const forged = await signInAttempt(
      { host: "bench.test", "x-forwarded-host": "elsewhere.example" },
      "http://elsewhere.example",
    );
    expect(forged.status).toBe(403);
    expect(((await forged.json()) as { error: { code: string } }).error.code).toBe("bad_origin");

    process.env.TRUSTED_PROXY = "127.0.0.1";
    const proxied = await signInAttempt(
      { host: "127.0.0.1:3000", "x-forwarded-host": "bench.example", "x-forwarded-proto": "https" },
      "https://bench.example",
    );
    expect(proxied.status).toBe(401);
  });
});
