import { afterEach, describe, expect, it, vi } from "vitest";
import { appUrl, ConfigError, runLimits, sessionCookieConfig, sessionSecret } from "./config";

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
});
