import { afterEach, describe, expect, it, vi } from "vitest";
import {
  appUrl,
  ConfigError,
  knxNetIpSettings,
  liveSessionLimits,
  runLimits,
  sessionCookieConfig,
  sessionSecret,
} from "./config";

afterEach(() => {
  vi.unstubAllEnvs();
});

describe("configuration", () => {
  it("refuses to run production sessions without a configured secret", () => {
    vi.stubEnv("NODE_ENV", "production");
    vi.stubEnv("SESSION_SECRET", "");
    expect(() => sessionSecret()).toThrow(ConfigError);
    expect(() => appUrl()).toThrow(/APP_URL/);
    expect(sessionCookieConfig()).toMatchObject({ secure: true, name: "__Host-benchline-session" });
  });

  it("lets the local demo serve a production build over plain http", () => {
    vi.stubEnv("NODE_ENV", "production");
    vi.stubEnv("SESSION_SECRET", "");
    vi.stubEnv("BENCHLINE_DEMO", "true");
    vi.stubEnv("DEV_SESSION_SECRET_FILE", "/nonexistent-dir/readonly/secret");
    expect(sessionSecret().length).toBeGreaterThanOrEqual(32);
    expect(appUrl()).toBe("http://localhost:3000");
    expect(sessionCookieConfig()).toMatchObject({ secure: false, name: "benchline-session" });
  });

  it("names the variable when a boolean setting is not a boolean", () => {
    vi.stubEnv("BENCHLINE_DEMO", "yes");
    vi.stubEnv("NODE_ENV", "production");
    vi.stubEnv("SESSION_SECRET", "");
    expect(() => sessionSecret()).toThrow(/BENCHLINE_DEMO/);
  });

  it("reads the run limits and caps, with defaults, and names a bad one", () => {
    for (const name of [
      "RUN_LIMIT_PER_MEMBER",
      "RUN_LIMIT_PER_WORKSPACE",
      "RUN_WALL_TIME_CAP_SECONDS",
      "RUN_VIRTUAL_TIME_CAP_MINUTES",
    ])
      vi.stubEnv(name, "");
    expect(runLimits()).toEqual({
      perMember: 4,
      perWorkspace: 12,
      wallTimeMs: 20_000,
      virtualTimeUs: 360 * 60_000_000,
    });
    vi.stubEnv("RUN_WALL_TIME_CAP_SECONDS", "5");
    expect(runLimits().wallTimeMs).toBe(5_000);
    vi.stubEnv("RUN_LIMIT_PER_MEMBER", "0");
    expect(() => runLimits()).toThrow(/RUN_LIMIT_PER_MEMBER must be a whole number from 1/);
  });

  it("reads the live-session limits and idle time, with defaults, and names a bad one", () => {
    for (const name of [
      "LIVE_SESSION_LIMIT_PER_MEMBER",
      "LIVE_SESSION_LIMIT_PER_WORKSPACE",
      "LIVE_SESSION_IDLE_MINUTES",
    ])
      vi.stubEnv(name, "");
    expect(liveSessionLimits()).toEqual({ perMember: 2, perWorkspace: 10, idleMs: 30 * 60_000 });
    vi.stubEnv("LIVE_SESSION_IDLE_MINUTES", "5");
    expect(liveSessionLimits().idleMs).toBe(5 * 60_000);
    vi.stubEnv("LIVE_SESSION_LIMIT_PER_MEMBER", "0");
    expect(() => liveSessionLimits()).toThrow(/LIVE_SESSION_LIMIT_PER_MEMBER/);
  });

  it("binds KNXnet/IP to the loopback address on 3671-3680 unless told otherwise, and names a bad setting", () => {
    vi.stubEnv("KNXNET_HOST", "");
    vi.stubEnv("KNXNET_PORTS", "");
    vi.stubEnv("KNXNET_TUNNELS", "");
    // 3671 is the standard KNXnet/IP port (knx-reference.md).
    expect(knxNetIpSettings()).toEqual({
      host: "127.0.0.1",
      loopback: true,
      ports: { first: 3671, last: 3680 },
      tunnels: 4,
    });
    vi.stubEnv("KNXNET_HOST", "192.0.2.10");
    vi.stubEnv("KNXNET_PORTS", "0");
    expect(knxNetIpSettings()).toMatchObject({
      host: "192.0.2.10",
      loopback: false,
      ports: { first: 0, last: 0 },
    });
    vi.stubEnv("KNXNET_HOST", "bench.example");
    expect(() => knxNetIpSettings()).toThrow(/KNXNET_HOST "bench.example" is not an IPv4 address/);
    vi.stubEnv("KNXNET_HOST", "");
    for (const bad of ["3680-3671", "70000", "abc", "0-5"]) {
      vi.stubEnv("KNXNET_PORTS", bad);
      expect(() => knxNetIpSettings(), bad).toThrow(/KNXNET_PORTS/);
    }
  });
});
