import { NextResponse, type NextRequest } from "next/server";
import { isAllowedOrigin, originPolicyFromEnv, REQUEST_PATH_HEADER, type OriginPolicy } from "@/lib/base/origins";
import { STATIC_SECURITY_HEADERS, STRICT_TRANSPORT_SECURITY } from "@/lib/base/security-headers";

// Runs before every page and server action (Next 16 Proxy, Node.js runtime): a fresh CSP nonce per page
// request, the security headers, a 400 for URLs that cannot be decoded, and a 403 (not a 500) for a
// server action posted from another origin. API routes (/api/…) do not pass through it: they answer JSON
// or files, never a document that runs scripts, so their fixed deny-all CSP and headers come from
// next.config.ts (lib/base/security-headers.ts), and lib/server/api.ts checks their URL and Origin.

const isDev = process.env.NODE_ENV === "development";

/**
 * Scripts only with this request's nonce ('strict-dynamic' lets Next's own chunks load theirs); styles
 * from our files or with the nonce, plus style attributes, which React Flow and the plots set for positions
 * and sizes; fonts, images and the engine's Web Worker from this origin only; never framed.
 */
export function contentSecurityPolicy(nonce: string, https: boolean): string {
  const directives = [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${isDev ? " 'unsafe-eval'" : ""}`,
    // The dev server injects styles without a nonce; production serves them as files.
    isDev ? "style-src 'self' 'unsafe-inline'" : `style-src 'self' 'nonce-${nonce}'`,
    "style-src-attr 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    `connect-src 'self'${isDev ? " ws:" : ""}`,
    "worker-src 'self' blob:",
    "manifest-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
    ...(https ? ["upgrade-insecure-requests"] : []),
  ];
  return directives.join("; ");
}

function jsonError(status: number, code: string, message: string): NextResponse {
  return NextResponse.json({ error: { code, message } }, { status, headers: { "cache-control": "no-store" } });
}

function setSecurityHeaders(headers: Headers, csp: string, https: boolean): void {
  headers.set("content-security-policy", csp);
  for (const { key, value } of STATIC_SECURITY_HEADERS) headers.set(key, value);
  if (https) headers.set("strict-transport-security", STRICT_TRANSPORT_SECURITY);
}

function decodablePath(request: NextRequest): boolean {
  try {
    decodeURIComponent(request.nextUrl.pathname);
    return true;
  } catch {
    return false;
  }
}

function malformedUrl(): NextResponse {
  return jsonError(400, "bad_request", "The URL has a malformed percent-encoding (a % not followed by two hex digits of valid UTF-8).");
}

let cachedPolicy: { key: string; policy: OriginPolicy } | null = null;

/** The origin policy, parsed again only when APP_URL, APP_ORIGIN or TRUST_PROXY change (tests change them). */
function currentOriginPolicy(): OriginPolicy {
  const key = `${process.env.APP_URL ?? ""}\n${process.env.APP_ORIGIN ?? ""}\n${process.env.TRUST_PROXY ?? ""}`;
  if (cachedPolicy?.key !== key) cachedPolicy = { key, policy: originPolicyFromEnv(process.env) };
  return cachedPolicy.policy;
}

export function proxy(request: NextRequest): NextResponse {
  const policy = currentOriginPolicy();
  const https = policy.appOrigin.startsWith("https:");
  if (request.nextUrl.pathname.startsWith("/api/")) return decodablePath(request) ? NextResponse.next() : malformedUrl();
  const nonce = Buffer.from(crypto.randomUUID()).toString("base64");
  const csp = contentSecurityPolicy(nonce, https);

  let response: NextResponse;
  if (!decodablePath(request)) {
    response = malformedUrl();
  } else if (request.method === "POST" && request.headers.has("next-action") && !isAllowedOrigin(request, policy)) {
    // Next would throw on the mismatch and answer 500; this is a refusal, so 403.
    response = jsonError(403, "forbidden", "Cross-site request refused: the Origin does not match this site.");
  } else {
    const requestHeaders = new Headers(request.headers);
    // Next reads the nonce from the request's CSP header and puts it on its own scripts; the root layout reads x-nonce.
    requestHeaders.set("x-nonce", nonce);
    requestHeaders.set("content-security-policy", csp);
    // The page asked for, so that a signed-out visitor is sent to sign-in with it as `next` (server
    // components cannot see the URL otherwise). Set here, never taken from the client.
    requestHeaders.set(REQUEST_PATH_HEADER, `${request.nextUrl.pathname}${request.nextUrl.search}`);
    // Without trusted proxies, X-Forwarded-Host is whatever the client wrote: Next's own server-action
    // check must compare the Origin with the real Host instead.
    if (policy.trustProxyHops === 0) {
      const host = request.headers.get("host");
      if (host) requestHeaders.set("x-forwarded-host", host);
      else requestHeaders.delete("x-forwarded-host");
    }
    response = NextResponse.next({ request: { headers: requestHeaders } });
  }
  setSecurityHeaders(response.headers, csp, https);
  return response;
}

export const config = {
  // Everything except the API and the hashed static files (next.config.ts gives both their headers), but
  // API paths with a percent sign come here too: Next answers a 500 for one that does not decode.
  matcher: ["/((?!api/|api$|_next/static|_next/image|favicon.ico).*)", "/api/(.*%.*)"],
};
