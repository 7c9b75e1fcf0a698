import { afterEach, describe, expect, it, vi } from "vitest";
import { appUrl, ConfigError, sessionCookieConfig, sessionSecret } from "./config";

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
});
