import bcrypt from "bcryptjs";
import { z } from "zod";
import {
  countRecentAccountFailures,
  countRecentAddressFailures,
  countRecentPairFailures,
  recordLoginAttempt,
} from "@/db/queries/login-attempts";
import { findUserByEmail, normalizeEmail } from "@/db/queries/users";
import { listWorkspacesForUser } from "@/db/queries/workspaces";
import { passwordHashCost } from "./config";
import { AppError } from "./errors";
import type { SessionPayload } from "./session";

/**
 * Sign-in limits. Failures are counted in a sliding window from the
 * login_attempts table: per (client address, account) pair (a correct password
 * from that address resets its count) and per client address (across accounts,
 * so one machine cannot try many). There is no lock on the account as a whole:
 * whoever knows an address could otherwise lock its owner out; failures from
 * one address hold back that address only.
 *
 * Without a trusted proxy the client address is unknown (Next does not tell a
 * route handler who connected), so every client would share one pair per
 * account and refusing it would lock the owner out again. Then a failure
 * streak on an account slows each further attempt down instead
 * (`unknownAddressDelayMs`), and the right password still signs in.
 */
export const signInLimits = {
  windowMs: 15 * 60 * 1000,
  /**
   * The 6th attempt on an account from one client address within the window is
   * refused without checking the password; other addresses are not affected.
   */
  failuresPerAccount: 5,
  /** The 21st attempt from one address within the window is refused. */
  failuresPerAddress: 20,
  /** From an unknown address: the first slowed attempt waits this long, and each further failure doubles it. */
  firstDelayMs: 1_000,
  /** From an unknown address: the longest wait before an attempt is checked. */
  longestDelayMs: 16_000,
} as const;

/**
 * How long an attempt on an account waits before its password is checked when
 * the client address is unknown: nothing until `failuresPerAccount` recent
 * failures, then 1 s doubling per failure up to 16 s. Slowing down, not
 * refusing, so someone who knows an e-mail address cannot lock its owner out;
 * with bcrypt at cost 12 on top, guessing stays slow.
 */
export function unknownAddressDelayMs(recentFailures: number): number {
  const over = recentFailures - signInLimits.failuresPerAccount;
  if (over < 0) return 0;
  return Math.min(signInLimits.longestDelayMs, signInLimits.firstDelayMs * 2 ** Math.min(over, 30));
}

const sleep = (ms: number) => new Promise<void>((resolve) => setTimeout(resolve, ms));

/**
 * Password-reset request limits: every request counts (each may send a mail),
 * per e-mail address asked for, whether or not it has an account, so being
 * limited tells nothing about the account, and per client address.
 */
export const passwordResetLimits = {
  windowMs: 60 * 60 * 1000,
  /** The 4th request for one e-mail address within the window is refused. */
  requestsPerEmail: 3,
  /** The 11th request from one client address within the window is refused. */
  requestsPerAddress: 10,
} as const;

/** The one answer to a reset request that was taken, whether or not the account exists. */
export const passwordResetAcceptedMessage =
  "if that address has an account, a reset link is on its way";
export const passwordResetLimitedMessage =
  "too many password-reset requests; wait an hour and try again";

/** One message for every sign-in failure: it never tells whether the account exists. */
export const signInFailedMessage = "that e-mail and password do not match an active account";
export const signInLimitedMessage =
  "too many sign-in attempts from here; wait 15 minutes or reset your password";

export const emailSchema = z
  .string({ error: "enter an e-mail address" })
  .trim()
  .min(3, "enter an e-mail address")
  .max(254, "an e-mail address has at most 254 characters")
  .pipe(z.email({ error: "enter a valid e-mail address" }))
  .transform(normalizeEmail);

/** New passwords: long enough to resist guessing, short enough for bcrypt's 72-byte input. */
export const newPasswordSchema = z
  .string({ error: "enter a password" })
  .min(10, "a password needs at least 10 characters")
  .refine((value) => new TextEncoder().encode(value).byteLength <= 72, {
    message: "a password has at most 72 bytes",
  });

/** A password as typed at sign-in: not re-checked against the policy. */
export const passwordInputSchema = z
  .string({ error: "enter your password" })
  .min(1, "enter your password")
  .max(200, "a password has at most 200 characters");

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, passwordHashCost());
}

export function verifyPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}

// Compared against when the account does not exist, so an unknown e-mail takes
// as long as a wrong password: made once per process at the configured cost
// (12 in production, like the stored hashes).
const absentAccountHashes = new Map<number, string>();
function absentAccountHash(): string {
  const cost = passwordHashCost();
  let hash = absentAccountHashes.get(cost);
  if (!hash) {
    hash = bcrypt.hashSync("no account has this password", cost);
    absentAccountHashes.set(cost, hash);
  }
  return hash;
}

/**
 * Check an e-mail and password and open a session payload in the user's first
 * workspace (by name). Every failure is the same 401 message; limits give 429.
 */
export async function signInWithPassword({
  email,
  password,
  clientAddress,
  now = new Date(),
  wait = sleep,
}: {
  email: string;
  password: string;
  clientAddress: string | null;
  now?: Date;
  /** How the slow-down waits; tests pass a recorder instead of sleeping. */
  wait?: (ms: number) => Promise<void>;
}): Promise<SessionPayload> {
  const normalized = normalizeEmail(email);
  const since = new Date(now.getTime() - signInLimits.windowMs);
  const pairFailures = countRecentPairFailures({ email: normalized, clientAddress, since });
  if (clientAddress === null) {
    const delayMs = unknownAddressDelayMs(pairFailures);
    if (delayMs > 0) await wait(delayMs);
  } else if (
    pairFailures >= signInLimits.failuresPerAccount ||
    countRecentAddressFailures({ clientAddress, since }) >= signInLimits.failuresPerAddress
  ) {
    throw new AppError("rate_limited", signInLimitedMessage);
  }

  const user = findUserByEmail({ email: normalized });
  const matches = await verifyPassword(password, user?.passwordHash ?? absentAccountHash());
  const workspace = user ? listWorkspacesForUser({ userId: user.id })[0] : undefined;
  const succeeded = Boolean(user && matches && user.disabledAt === null && workspace);
  recordLoginAttempt({ email: normalized, clientAddress, succeeded, at: now });
  if (!succeeded || !user || !workspace) {
    throw new AppError("invalid_credentials", signInFailedMessage);
  }
  return {
    userId: user.id,
    workspaceId: workspace.workspace.id,
    sessionVersion: user.sessionVersion,
    issuedAt: now.getTime(),
  };
}

// Reset requests share sign-in's attempts table and counting queries under keys
// of their own (no e-mail or address contains a space), so neither limit eats
// into the other's count. A request is stored as a failed attempt: it counts.
const passwordResetKey = (value: string) => `password-reset ${value}`;

/**
 * Count a password-reset request against its limits, or refuse it with 429 when
 * the e-mail address or the client address has asked too often in the window.
 * Refused requests are not counted, as at sign-in.
 */
export function admitPasswordResetRequest({
  email,
  clientAddress,
  now = new Date(),
}: {
  email: string;
  clientAddress: string | null;
  now?: Date;
}): void {
  const emailKey = passwordResetKey(normalizeEmail(email));
  const addressKey = clientAddress === null ? null : passwordResetKey(clientAddress);
  const since = new Date(now.getTime() - passwordResetLimits.windowMs);
  if (
    countRecentAccountFailures({ email: emailKey, since }) >=
      passwordResetLimits.requestsPerEmail ||
    (addressKey !== null &&
      countRecentAddressFailures({ clientAddress: addressKey, since }) >=
        passwordResetLimits.requestsPerAddress)
  ) {
    throw new AppError("rate_limited", passwordResetLimitedMessage);
  }
  recordLoginAttempt({ email: emailKey, clientAddress: addressKey, succeeded: false, at: now });
}

/**
 * Sharing run reports by e-mail: each share sends a mail from the app to a
 * colleague, so a member may send only so many in a window. Counted in the
 * same attempts table as sign-in and reset requests, under a key of its own.
 */
export const runShareLimits = {
  windowMs: 60 * 60 * 1000,
  /** The 11th share by one member within the window is refused. */
  sharesPerMember: 10,
} as const;

export const runShareLimitedMessage = `you have shared ${runShareLimits.sharesPerMember} run reports by e-mail in the last hour; wait a while before sharing more`;

const runShareKey = (userId: string) => `run-share ${userId}`;

/** Count one run-report share against the member's limit, or refuse it with 429. */
export function admitRunShare({ userId, now = new Date() }: { userId: string; now?: Date }): void {
  const key = runShareKey(userId);
  const since = new Date(now.getTime() - runShareLimits.windowMs);
  if (countRecentAccountFailures({ email: key, since }) >= runShareLimits.sharesPerMember) {
    throw new AppError("rate_limited", runShareLimitedMessage);
  }
  recordLoginAttempt({ email: key, clientAddress: null, succeeded: false, at: now });
}
