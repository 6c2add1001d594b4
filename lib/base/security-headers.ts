// The security headers every response carries. Pages get them from proxy.ts (with their CSP nonce); the
// API and the hashed static files get the fixed ones from next.config.ts's headers(), which Next applies
// from its routes manifest without running the proxy (the proxy doubled the cost of a small API request:
// 422 → 768 session checks per second on 2 cores, tests/bench/api.ts); route handlers add HSTS
// (lib/server/api.ts), since whether the app is served over https is known only at run time.

/** Headers that do not depend on the request, the nonce or the scheme. */
export const STATIC_SECURITY_HEADERS: ReadonlyArray<{ key: string; value: string }> = [
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
  { key: "X-Frame-Options", value: "DENY" },
  { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
  { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=(), payment=()" },
];

/** The API's documents load nothing and are never framed (no nonce: nothing in them runs). */
export const API_CONTENT_SECURITY_POLICY = "default-src 'none'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'";

/** A browser remembers this for a year: sent only when the app is served over https. */
export const STRICT_TRANSPORT_SECURITY = "max-age=31536000; includeSubDomains";
