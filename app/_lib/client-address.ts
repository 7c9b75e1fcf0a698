import { trustedProxies } from "./config";

/**
 * Who sent this request and which origin they reached, as far as the server
 * can know. Next's route handlers are not given the socket's address, and
 * Next fills X-Forwarded-For / -Host from the socket only when the client did
 * not send them, so these headers are whatever the client chose unless a
 * reverse proxy in front (TRUSTED_PROXY) sets them. Without a trusted proxy
 * they are ignored: the client address is unknown (null) and the origin is the
 * Host header.
 */

/**
 * The client's address for per-address limits: behind trusted proxies, the
 * right-most X-Forwarded-For entry that is not one of them (each proxy
 * appends the address it was reached from); null when no proxy is trusted,
 * so a forged header can never choose the bucket a request is counted in.
 */
export function clientAddressOf(request: Request): string | null {
  const proxies = trustedProxies();
  if (proxies.length === 0) return null;
  const hops = (request.headers.get("x-forwarded-for") ?? "")
    .split(",")
    .map((part) => part.trim())
    .filter(Boolean);
  for (let i = hops.length - 1; i >= 0; i--) {
    const hop = hops[i]!;
    if (!proxies.includes(hop)) return hop.slice(0, 64);
  }
  return null;
}

/**
 * The origin the browser used to reach the app, from the Host header (and,
 * behind a trusted proxy, X-Forwarded-Host and -Proto); null without a Host.
 */
export function reachedOriginOf(request: Request): string | null {
  const url = new URL(request.url);
  const trusted = trustedProxies().length > 0;
  const forwardedHost = trusted ? firstEntry(request.headers.get("x-forwarded-host")) : null;
  const host = forwardedHost ?? firstEntry(request.headers.get("host"));
  if (!host) return null;
  const proto =
    (trusted ? firstEntry(request.headers.get("x-forwarded-proto")) : null) ??
    url.protocol.replace(":", "");
  return `${proto}://${host}`;
}

function firstEntry(value: string | null): string | null {
  const first = value?.split(",")[0]?.trim();
  return first ? first : null;
}
