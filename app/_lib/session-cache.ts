/**
 * Unsealed session cookies, remembered by their exact value. Opening a seal
 * (iron-session: two key derivations, an HMAC and an AES decryption through
 * WebCrypto) was the largest single cost of an authenticated read. A cookie's
 * contents never change, so once a value has been opened with the current
 * secret its payload can be reused until the seal itself expires.
 *
 * Only the unsealing is remembered. Whether the session is still valid (user
 * present and enabled, session version unchanged, membership present, role)
 * is read from the database on every request as before, so sign-out, a role
 * change or a removal still end the session at once. Only values that opened
 * successfully are kept, so a stream of forged cookies cannot fill the cache,
 * and it is bounded: the oldest entry goes first.
 */
export interface CachedSeal<P> {
  readonly payload: P;
  /** The seal's own expiry (iron's expiration field, authenticated by its MAC), ms since the epoch; null when it has none. */
  readonly sealExpiresAt: number | null;
}

export const sessionCacheCapacity = 1000;

interface Store {
  secret: string;
  entries: Map<string, CachedSeal<unknown>>;
}

// Shared through globalThis: Next may load this module once per route bundle.
const globalForCache = globalThis as unknown as { __benchlineSessionCache?: Store };

function storeFor(secret: string): Store {
  const store = globalForCache.__benchlineSessionCache;
  // A new secret makes every earlier seal invalid: forget them all.
  if (store && store.secret === secret) return store;
  const fresh: Store = { secret, entries: new Map() };
  globalForCache.__benchlineSessionCache = fresh;
  return fresh;
}

/** The remembered payload of this cookie value under this secret, if any. */
export function cachedSeal<P>(secret: string, value: string): CachedSeal<P> | undefined {
  return storeFor(secret).entries.get(value) as CachedSeal<P> | undefined;
}

/** Remember a cookie value that opened; evicts the oldest entry beyond the capacity. */
export function rememberSeal<P>(secret: string, value: string, entry: CachedSeal<P>): void {
  const { entries } = storeFor(secret);
  entries.delete(value);
  entries.set(value, entry);
  if (entries.size > sessionCacheCapacity) {
    entries.delete(entries.keys().next().value!);
  }
}

/** Forget one cookie value (it expired). */
export function forgetSeal(secret: string, value: string): void {
  storeFor(secret).entries.delete(value);
}

/** How many cookie values are remembered (tests). */
export function sessionCacheSize(): number {
  return globalForCache.__benchlineSessionCache?.entries.size ?? 0;
}

/**
 * The expiry written into an iron seal (`Fe26.2*id*salt*iv*data*expiration*salt*mac`,
 * with iron-session's `~2` version suffix after the MAC), or null when it has none.
 */
export function sealExpiration(value: string): number | null {
  const field = value.split("*")[5];
  if (!field || !/^\d+$/.test(field)) return null;
  return Number.parseInt(field, 10);
}

/** iron refuses a seal once its expiry is this far in the past (its default clock skew allowance). */
export const sealClockSkewMs = 60_000;
