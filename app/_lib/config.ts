import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { isIP } from "node:net";
import path from "node:path";

/**
 * Server configuration read from the environment. Every value is read lazily
 * (a function call at request time), never at import, so `next build` can
 * evaluate modules without production secrets and tests can set variables
 * before the first request.
 *
 * | variable                | meaning                                                | default                                            |
 * | ----------------------- | ------------------------------------------------------ | -------------------------------------------------- |
 * | SESSION_SECRET          | iron-session password, at least 32 characters          | production: none (error); else generated, kept in data/ |
 * | SESSION_COOKIE_SECURE   | "true" / "false": the cookie's Secure flag             | production: true; else false                        |
 * | SESSION_COOKIE_NAME     | the cookie's name                                      | "__Host-benchline-session" when secure, else "benchline-session" |
 * | SESSION_TTL_SECONDS     | how long a sign-in lasts                               | 8 hours                                            |
 * | APP_URL                 | origin used in e-mailed links and the Origin check     | production: none (error when a link is built); else http://localhost:3000 |
 * | PASSWORD_HASH_COST      | bcrypt cost for new hashes                             | 12 (production never goes below 12)                |
 * | SMTP_URL / MAIL_FROM    | nodemailer SMTP transport / sender address             | none: mail is stored in the outbox table           |
 * | BENCHLINE_DEMO          | "true": the local demo (`npm run demo`) over plain http | off                                                |
 * | RUN_LIMIT_PER_MEMBER    | server runs (a scenario or a whole suite) one member may have queued or running | 4  |
 * | RUN_LIMIT_PER_WORKSPACE | the same, for everyone in one workspace together       | 12                                                 |
 * | RUN_WALL_TIME_CAP_SECONDS | wall-clock seconds one scenario may run on the server | 20                                                |
 * | RUN_VIRTUAL_TIME_CAP_MINUTES | virtual minutes one scenario may cover at worst   | 360 (6 h)                                          |
 * | LIVE_SESSION_IDLE_MINUTES | a server-hosted live session with no viewer, command or tunnel for this long stops | 30 |
 * | LIVE_SESSION_LIMIT_PER_MEMBER | server-hosted live sessions one member may run at once | 2                           |
 * | LIVE_SESSION_LIMIT_PER_WORKSPACE | the same, for everyone in one workspace together | 10                           |
 * | KNXNET_HOST             | IPv4 address published sessions' KNXnet/IP endpoints bind to (KNXnet/IP has no authentication) | 127.0.0.1 |
 * | KNXNET_PORTS            | UDP port range for endpoints, "first-last" (the first free one is taken), or "0" for any free port | 3671-3680 |
 * | KNXNET_TUNNELS          | tunnels one published session accepts at once          | 4                                                  |
 * | TRUSTED_PROXY           | comma-separated IP addresses of the reverse proxies in front of Benchline; only then are X-Forwarded-For/-Host/-Proto believed | none: those headers are ignored |
 *
 * The demo serves a production build on http://localhost:3000 for one person
 * trying Benchline; with BENCHLINE_DEMO=true the production-only requirements
 * (a configured secret, a Secure cookie, APP_URL) fall back to the development
 * defaults. Never set it on a server others reach.
 */

export class ConfigError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "ConfigError";
  }
}

export function isProduction(): boolean {
  return process.env.NODE_ENV === "production";
}

/** The local demo: a production build served over plain http to the person running it. */
function isLocalDemo(): boolean {
  return booleanFromEnv("BENCHLINE_DEMO", false);
}

/** Whether the strict production defaults apply (secret, Secure cookie, APP_URL required). */
function strictDefaults(): boolean {
  return isProduction() && !isLocalDemo();
}

const minimumSecretLength = 32;

let developmentSecret: string | undefined;

/**
 * A development secret generated once and kept in data/ (git-ignored), so a dev
 * server restart does not sign everyone out. Never used in production.
 */
function generatedDevelopmentSecret(): string {
  if (developmentSecret) return developmentSecret;
  const file = path.resolve(process.env.DEV_SESSION_SECRET_FILE ?? "data/dev-session-secret");
  if (existsSync(file)) {
    const stored = readFileSync(file, "utf8").trim();
    if (stored.length >= minimumSecretLength) return (developmentSecret = stored);
  }
  const secret = randomBytes(32).toString("base64url");
  try {
    mkdirSync(path.dirname(file), { recursive: true });
    writeFileSync(file, secret, { mode: 0o600 });
  } catch {
    // A read-only checkout still works; sessions just end when the process does.
  }
  return (developmentSecret = secret);
}

/** The password iron-session seals the cookie with. */
export function sessionSecret(): string {
  const secret = process.env.SESSION_SECRET;
  if (secret !== undefined && secret !== "") {
    if (secret.length < minimumSecretLength) {
      throw new ConfigError(
        `SESSION_SECRET is ${secret.length} characters long; it needs at least ${minimumSecretLength} (e.g. \`openssl rand -base64 32\`).`,
      );
    }
    return secret;
  }
  if (strictDefaults()) {
    throw new ConfigError(
      "SESSION_SECRET is not set. In production Benchline refuses to start sessions without it: set SESSION_SECRET to a random string of at least 32 characters (e.g. `openssl rand -base64 32`).",
    );
  }
  return generatedDevelopmentSecret();
}

function booleanFromEnv(name: string, fallback: boolean): boolean {
  const value = process.env[name]?.trim().toLowerCase();
  if (value === undefined || value === "") return fallback;
  if (value === "true" || value === "1") return true;
  if (value === "false" || value === "0") return false;
  throw new ConfigError(`${name} must be "true" or "false", not "${process.env[name]}".`);
}

export interface SessionCookieConfig {
  readonly name: string;
  readonly secure: boolean;
  readonly ttlSeconds: number;
}

/** Cookie settings: strict in production, overridable so browser tests over plain http work. */
export function sessionCookieConfig(): SessionCookieConfig {
  const secure = booleanFromEnv("SESSION_COOKIE_SECURE", strictDefaults());
  // The __Host- prefix makes the browser insist on Secure, Path=/ and no Domain,
  // so only usable when the cookie is secure.
  const name =
    process.env.SESSION_COOKIE_NAME?.trim() ||
    (secure ? "__Host-benchline-session" : "benchline-session");
  const ttlSeconds = Number(process.env.SESSION_TTL_SECONDS ?? 8 * 60 * 60);
  if (!Number.isInteger(ttlSeconds) || ttlSeconds < 60) {
    throw new ConfigError("SESSION_TTL_SECONDS must be a whole number of seconds, at least 60.");
  }
  return { name, secure, ttlSeconds };
}

/** The app's own origin, for links in e-mail. */
export function appUrl(): string {
  const value = process.env.APP_URL?.trim();
  if (value) {
    try {
      return new URL(value).origin;
    } catch {
      throw new ConfigError(`APP_URL "${value}" is not a URL.`);
    }
  }
  // Links in mail must never be built from a request's Host header (a forged
  // host would send a reset token to someone else's server), so production
  // needs it spelled out.
  if (strictDefaults()) {
    throw new ConfigError(
      "APP_URL is not set. In production the links in invitation and password-reset mail need it, e.g. APP_URL=https://bench.example.",
    );
  }
  return "http://localhost:3000";
}

/** bcrypt's production cost. */
export const productionPasswordHashCost = 12;

/**
 * bcrypt cost for new hashes. Tests may set PASSWORD_HASH_COST lower (bcryptjs
 * at cost 12 takes a noticeable fraction of a second per hash, which would make
 * the API suite slow); production ignores any value below 12.
 */
export function passwordHashCost(): number {
  const value = Number(process.env.PASSWORD_HASH_COST ?? productionPasswordHashCost);
  if (!Number.isInteger(value) || value < 4 || value > 16) {
    throw new ConfigError("PASSWORD_HASH_COST must be a whole number from 4 to 16.");
  }
  return isProduction() ? Math.max(value, productionPasswordHashCost) : value;
}

/** How much of the run pool one member and one workspace may hold, and the caps on one scenario. */
export interface RunLimits {
  /** Runs (a scenario, or a suite as a whole) one member may have queued or running at once. */
  readonly perMember: number;
  /** The same for a whole workspace, so a team cannot starve other workspaces either. */
  readonly perWorkspace: number;
  /** Wall-clock milliseconds one scenario may run on the server. */
  readonly wallTimeMs: number;
  /** Virtual microseconds one scenario may reach, at worst. */
  readonly virtualTimeUs: number;
}

function wholeNumberFromEnv(name: string, fallback: number, min: number, max: number): number {
  const text = process.env[name]?.trim();
  if (text === undefined || text === "") return fallback;
  const value = Number(text);
  if (!Number.isInteger(value) || value < min || value > max) {
    throw new ConfigError(`${name} must be a whole number from ${min} to ${max}, not "${text}".`);
  }
  return value;
}

/**
 * Limits of server-side runs. The defaults suit one small server shared by a
 * training workshop: a member can queue a few runs while editing, a busy
 * workspace a dozen, and no single scenario can hold a worker for long. The
 * shipped scenarios reach at most a few minutes of virtual time and finish in
 * well under a second each, far inside both caps.
 */
export function runLimits(): RunLimits {
  return {
    perMember: wholeNumberFromEnv("RUN_LIMIT_PER_MEMBER", 4, 1, 1000),
    perWorkspace: wholeNumberFromEnv("RUN_LIMIT_PER_WORKSPACE", 12, 1, 10_000),
    wallTimeMs: wholeNumberFromEnv("RUN_WALL_TIME_CAP_SECONDS", 20, 1, 3600) * 1000,
    virtualTimeUs: wholeNumberFromEnv("RUN_VIRTUAL_TIME_CAP_MINUTES", 360, 1, 24 * 60) * 60_000_000,
  };
}

/**
 * The reverse proxies whose X-Forwarded-* headers are believed (TRUSTED_PROXY,
 * comma-separated IP addresses). Empty: Benchline is reached directly and
 * ignores those headers, since any client can send them. Set it only when
 * Benchline can be reached through these proxies alone.
 */
export function trustedProxies(): readonly string[] {
  const value = process.env.TRUSTED_PROXY?.trim() ?? "";
  if (value === "") return [];
  const addresses = value.split(",").map((part) => part.trim());
  for (const address of addresses) {
    if (isIP(address) === 0) {
      throw new ConfigError(
        `TRUSTED_PROXY lists "${address}", which is not an IP address; give the proxies' addresses separated by commas, e.g. TRUSTED_PROXY=127.0.0.1,10.0.0.5.`,
      );
    }
  }
  return addresses;
}

/** Limits and idle time of server-hosted live sessions (app/_lib/live/). */
export interface LiveSessionLimits {
  readonly perMember: number;
  readonly perWorkspace: number;
  /** Wall milliseconds without a viewer, a command or a tunnel after which a session stops. */
  readonly idleMs: number;
}

/**
 * A session runs its bench at real time whether anyone watches or not (outside
 * software may be connected), so each one costs the server a little all the
 * time: a member may keep two (say, a bench and its practice copy), a workspace
 * a class's worth, and a forgotten one stops after half an hour.
 */
export function liveSessionLimits(): LiveSessionLimits {
  return {
    perMember: wholeNumberFromEnv("LIVE_SESSION_LIMIT_PER_MEMBER", 2, 1, 100),
    perWorkspace: wholeNumberFromEnv("LIVE_SESSION_LIMIT_PER_WORKSPACE", 10, 1, 1000),
    idleMs: wholeNumberFromEnv("LIVE_SESSION_IDLE_MINUTES", 30, 1, 24 * 60) * 60_000,
  };
}

/** Where published sessions answer KNXnet/IP. */
export interface KnxNetIpSettings {
  /** IPv4 address to bind; 127.0.0.1 unless KNXNET_HOST names another. */
  readonly host: string;
  /** True when `host` is on the loopback network: only this machine can reach it. */
  readonly loopback: boolean;
  /** Inclusive port range tried in order; { 0, 0 } asks the system for any free port. */
  readonly ports: { readonly first: number; readonly last: number };
  readonly tunnels: number;
}

/**
 * KNXnet/IP has no authentication: whoever reaches the port can write to the
 * bench. So endpoints bind to the loopback address unless KNXNET_HOST says
 * otherwise, and the console warns when it does.
 */
export function knxNetIpSettings(): KnxNetIpSettings {
  const host = process.env.KNXNET_HOST?.trim() || "127.0.0.1";
  if (isIP(host) !== 4) {
    throw new ConfigError(
      `KNXNET_HOST "${host}" is not an IPv4 address; KNXnet/IP runs over IPv4, e.g. KNXNET_HOST=127.0.0.1.`,
    );
  }
  const text = process.env.KNXNET_PORTS?.trim() || "3671-3680";
  const match = /^(\d{1,5})(?:-(\d{1,5}))?$/.exec(text);
  const first = Number(match?.[1]);
  const last = Number(match?.[2] ?? match?.[1]);
  const valid =
    match !== null &&
    ((first === 0 && last === 0) || (first >= 1 && last <= 65535 && first <= last));
  if (!valid) {
    throw new ConfigError(
      `KNXNET_PORTS must be a UDP port range like "3671-3680" (or "0" for any free port), not "${text}".`,
    );
  }
  return {
    host,
    loopback: host.startsWith("127."),
    ports: { first, last },
    tunnels: wholeNumberFromEnv("KNXNET_TUNNELS", 4, 1, 64),
  };
}
