// Origins, client addresses and redirect targets. No "server-only": proxy.ts imports this too.

/** Whether a URL names this machine (localhost, *.localhost, 127.0.0.0/8 or ::1). */
export function isLoopbackUrl(url: string): boolean {
  let host: string;
  try {
    host = new URL(url).hostname.toLowerCase();
  } catch {
    return false;
  }
  if (host === "localhost" || host.endsWith(".localhost")) return true;
  if (host === "[::1]") return true;
  return /^127(?:\.\d{1,3}){3}$/.test(host);
}

/** The last value of a comma-separated header that proxies append to. */
function lastListValue(value: string | null): string | null {
  if (!value) return null;
  const parts = value.split(",").map((part) => part.trim()).filter(Boolean);
  return parts.length > 0 ? parts[parts.length - 1] : null;
}

/**
 * The client address from X-Forwarded-For when `hops` proxies in front of the app are trusted: each
 * trusted proxy appends the address it saw, so the client is the `hops`-th entry from the right (entries
 * further left are whatever the client sent and prove nothing). With no trusted proxy there is no
 * address we can believe (the app server passes a client's own X-Forwarded-For through), so null.
 */
export function forwardedClientAddress(headers: Headers, hops: number): string | null {
  if (hops <= 0) return null;
  const entries = (headers.get("x-forwarded-for") ?? "")
    .split(",")
    .map((entry) => entry.trim())
    .filter(Boolean);
  if (entries.length === 0) return null;
  return entries[Math.max(0, entries.length - hops)].slice(0, 100);
}

/**
 * The origin this request was addressed to: the request URL's scheme and the Host header, or, behind
 * trusted proxies only, X-Forwarded-Proto and X-Forwarded-Host as the nearest proxy set them.
 */
export function requestSelfOrigin(request: { url: string; headers: Headers }, hops: number): string | null {
  try {
    const url = new URL(request.url);
    const forwardedHost = hops > 0 ? lastListValue(request.headers.get("x-forwarded-host")) : null;
    const forwardedProto = hops > 0 ? lastListValue(request.headers.get("x-forwarded-proto")) : null;
    const host = forwardedHost ?? request.headers.get("host") ?? url.host;
    const scheme = forwardedProto === "https" || forwardedProto === "http" ? forwardedProto : url.protocol.replace(/:$/, "");
    return new URL(`${scheme}://${host}`).origin;
  } catch {
    return null;
  }
}

export type OriginPolicy = {
  /** APP_URL's origin. */
  appOrigin: string;
  /** APP_ORIGIN, an extra origin accepted for state-changing requests. */
  extraOrigin: string | null;
  /** Whether APP_URL (or APP_ORIGIN) was set; if not, the request's own origin is accepted too. */
  explicit: boolean;
  trustProxyHops: number;
};

/**
 * Whether a state-changing request comes from our own pages: the whole Origin (scheme, host and port),
 * else the Referer's origin, must equal APP_URL's origin (or APP_ORIGIN). Without an explicit APP_URL the
 * request's own origin is accepted, which a cross-site page cannot forge (its browser sends the real one).
 */
export function isAllowedOrigin(request: { url: string; headers: Headers }, policy: OriginPolicy): boolean {
  const claimed = claimedOrigin(request.headers);
  if (!claimed) return false;
  if (claimed === policy.appOrigin || (policy.extraOrigin !== null && claimed === policy.extraOrigin)) return true;
  if (!policy.explicit) return claimed === requestSelfOrigin(request, policy.trustProxyHops);
  return false;
}

/** The Origin header's origin, else the Referer's; null when neither is a URL. */
export function claimedOrigin(headers: Headers): string | null {
  const origin = headers.get("origin");
  const referer = headers.get("referer");
  try {
    if (origin && origin !== "null") return new URL(origin).origin;
    if (referer) return new URL(referer).origin;
  } catch {
    return null;
  }
  return null;
}

// Tab, CR, LF and other controls are dropped by browsers when parsing a URL ("/\t/evil.example" becomes
// "//evil.example"), and a backslash counts as a slash: refuse them rather than guess.
const UNSAFE_IN_NEXT = /[\u0000-\u001F\u007F\\]/;

/**
 * Where to go after signing in (or accepting an invitation): only a path on this site. The value is
 * parsed with the URL parser against the app's origin and kept only if the result stays on that origin;
 * what is returned is the parsed, percent-encoded path, query and fragment (safe for a Location header).
 */
/** Request header the proxy sets to the path (and query) of the page asked for; see requireUser. */
export const REQUEST_PATH_HEADER = "x-portolan-path";

/**
 * The sign-in page for a signed-out visitor of `path`, carrying it as `next` when it is worth landing
 * on (not the projects list, which is where sign-in goes anyway).
 */
export function signInPathFor(path: string | null | undefined, appOrigin: string): string {
  const target = safeRedirectPath(path, appOrigin, "");
  if (!target || target === "/projects" || target === "/") return "/sign-in";
  return `/sign-in?next=${encodeURIComponent(target)}`;
}

export function safeRedirectPath(value: string | null | undefined, appOrigin: string, fallback = "/projects"): string {
  if (!value || value.length > 2000 || UNSAFE_IN_NEXT.test(value)) return fallback;
  if (!value.startsWith("/") || value.startsWith("//")) return fallback;
  let parsed: URL;
  try {
    parsed = new URL(value, appOrigin);
  } catch {
    return fallback;
  }
  if (parsed.origin !== new URL(appOrigin).origin) return fallback;
  // dot segments can leave a path that starts with "//" ("/.//evil.example" → "//evil.example"), which a
  // browser reads as another host: refuse it rather than hand back a protocol-relative URL
  if (parsed.pathname.startsWith("//")) return fallback;
  return `${parsed.pathname}${parsed.search}${parsed.hash}`;
}

/**
 * The origin policy from raw environment variables (APP_URL, APP_ORIGIN, TRUST_PROXY), for code that
 * cannot use lib/base/env.ts (proxy.ts). Invalid values fall back to the defaults here; env.ts reports them.
 */
export function originPolicyFromEnv(raw: Record<string, string | undefined>): OriginPolicy {
  const toOrigin = (value: string | undefined) => {
    try {
      return value ? new URL(value).origin : null;
    } catch {
      return null;
    }
  };
  const hops = Number(raw.TRUST_PROXY === "true" ? 1 : (raw.TRUST_PROXY ?? 0));
  const extraOrigin = toOrigin(raw.APP_ORIGIN);
  return {
    appOrigin: toOrigin(raw.APP_URL) ?? extraOrigin ?? "http://localhost:3000",
    extraOrigin,
    explicit: Boolean(raw.APP_URL || raw.APP_ORIGIN),
    trustProxyHops: Number.isInteger(hops) && hops > 0 && hops <= 10 ? hops : 0,
  };
}
