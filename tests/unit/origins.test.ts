import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { forwardedClientAddress, isAllowedOrigin, isLoopbackUrl, safeRedirectPath, signInPathFor, type OriginPolicy } from "@/lib/base/origins";
import { parseEnv } from "@/lib/base/env";

const APP = "https://portolan.example";

// Issue 12 item 2: `next` after sign-in goes only to a path on this site. Browsers drop tab, CR and LF
// inside URLs and read a backslash as a slash (WHATWG URL Standard, "basic URL parser": ASCII tab or
// newline removal, and "\" treated as "/" for special schemes), so "/\t/evil.example" would become
// "//evil.example", a different host.
describe("safeRedirectPath", () => {
  it.each([
    ["/\t/evil.example", "tab"],
    ["/\n/evil.example", "line feed"],
    ["/\r\n/evil.example", "CR LF"],
    ["/\\evil.example", "backslash"],
    ["\\\\evil.example", "two backslashes"],
    ["//evil.example", "protocol-relative"],
    ["///evil.example", "three slashes"],
    ["/.//evil.example", "dot segment before two slashes (found by the property below)"],
    ["/x/..//evil.example", "parent segment before two slashes"],
    ["https://evil.example/projects", "absolute elsewhere"],
    [`${APP}/projects`, "absolute here (not a path)"],
    ["javascript:alert(1)", "script URL"],
    ["projects", "relative without a slash"],
    ["/\u0000x", "NUL"],
    ["", "empty"],
  ])("refuses %j (%s)", (value) => {
    expect(safeRedirectPath(value, APP)).toBe("/projects");
  });

  it("keeps same-site paths with query and fragment, percent-encoded for a Location header", () => {
    expect(safeRedirectPath("/invite/abc", APP)).toBe("/invite/abc");
    expect(safeRedirectPath("/projects/p1/compare?a=1&b=2#top", APP)).toBe("/projects/p1/compare?a=1&b=2#top");
    expect(safeRedirectPath("/%2F%2Fevil.example", APP)).toBe("/%2F%2Fevil.example");
    expect(safeRedirectPath("/café", APP)).toBe("/caf%C3%A9");
    expect(safeRedirectPath(null, APP, "/home")).toBe("/home");
  });

  it("property: whatever the input, the answer is a path that resolves to the app's own origin and has no control characters", () => {
    fc.assert(
      fc.property(fc.oneof(fc.string(), fc.string().map((s) => `/${s}`), fc.webUrl(), fc.webPath()), (value) => {
        const result = safeRedirectPath(value, APP);
        expect(result.startsWith("/")).toBe(true);
        expect(result.startsWith("//")).toBe(false);
        expect(/[\u0000-\u001F\u007F\\]/.test(result)).toBe(false);
        expect(new URL(result, APP).origin).toBe(APP);
      }),
      { numRuns: 2000 },
    );
  });
});

// Issue 12 item 7: the whole origin (scheme, host and port) is compared; X-Forwarded-* only behind TRUST_PROXY.
describe("signInPathFor", () => {
  // The `next` parameter is a URL query value: it must round-trip through URLSearchParams (WHATWG URL
  // standard, application/x-www-form-urlencoded parsing) to the same path.
  it("carries a deep link as next, encoded so that the query parses back to the same path", () => {
    const target = "/projects/p1/signoffs?review=s1&x=a b#evidence";
    const to = signInPathFor(target, APP);
    const parsed = new URL(to, APP);
    expect(parsed.pathname).toBe("/sign-in");
    expect(parsed.searchParams.get("next")).toBe(safeRedirectPath(target, APP));
  });

  it("drops next for the projects list and for anything that is not a same-origin path", () => {
    for (const value of [null, "", "/", "/projects", "https://evil.example/x", "//evil.example", "/\\evil.example"]) {
      expect(signInPathFor(value, APP)).toBe("/sign-in");
    }
  });
});

describe("isAllowedOrigin", () => {
  const explicit: OriginPolicy = { appOrigin: APP, extraOrigin: null, explicit: true, trustProxyHops: 0 };
  const request = (headers: Record<string, string>, url = "http://10.0.0.5:3000/api/projects") => ({ url, headers: new Headers(headers) });

  it("accepts only APP_URL's exact origin when APP_URL is set", () => {
    expect(isAllowedOrigin(request({ origin: APP }), explicit)).toBe(true);
    expect(isAllowedOrigin(request({ origin: "http://portolan.example" }), explicit)).toBe(false);
    expect(isAllowedOrigin(request({ origin: "https://portolan.example:8443" }), explicit)).toBe(false);
    expect(isAllowedOrigin(request({ origin: "https://evil.portolan.example" }), explicit)).toBe(false);
    // The Host header does not widen it.
    expect(isAllowedOrigin(request({ origin: "http://10.0.0.5:3000", host: "10.0.0.5:3000" }), explicit)).toBe(false);
    expect(isAllowedOrigin(request({ referer: `${APP}/projects/x` }), explicit)).toBe(true);
    expect(isAllowedOrigin(request({}), explicit)).toBe(false);
  });

  it("without APP_URL, the request's own origin; X-Forwarded-Host counts only with TRUST_PROXY", () => {
    const implicit: OriginPolicy = { appOrigin: "http://localhost:3000", extraOrigin: null, explicit: false, trustProxyHops: 0 };
    expect(isAllowedOrigin(request({ origin: "http://10.0.0.5:3000", host: "10.0.0.5:3000" }), implicit)).toBe(true);
    expect(isAllowedOrigin(request({ origin: "http://evil.example", host: "10.0.0.5:3000", "x-forwarded-host": "evil.example" }), implicit)).toBe(false);
    const behindProxy = { ...implicit, trustProxyHops: 1 };
    const proxied = request({ origin: "https://team.example", host: "10.0.0.5:3000", "x-forwarded-host": "team.example", "x-forwarded-proto": "https" });
    expect(isAllowedOrigin(proxied, behindProxy)).toBe(true);
    expect(isAllowedOrigin(proxied, implicit)).toBe(false);
  });
});

describe("client address and environment", () => {
  it("X-Forwarded-For is believed only for the configured number of proxies, counted from the right", () => {
    const headers = new Headers({ "x-forwarded-for": "6.6.6.6, 198.51.100.9, 10.0.0.2" });
    expect(forwardedClientAddress(headers, 0)).toBeNull();
    expect(forwardedClientAddress(headers, 1)).toBe("10.0.0.2");
    expect(forwardedClientAddress(headers, 2)).toBe("198.51.100.9");
    expect(forwardedClientAddress(new Headers(), 1)).toBeNull();
  });

  it("the demo is seeded by default only on a loopback APP_URL; SEED_DEMO=1 forces it with a warning flag", () => {
    expect(isLoopbackUrl("http://localhost:3000")).toBe(true);
    expect(isLoopbackUrl("http://127.0.0.1:3210")).toBe(true);
    expect(isLoopbackUrl("http://[::1]:3000")).toBe(true);
    expect(isLoopbackUrl("https://portolan.example")).toBe(false);
    expect(isLoopbackUrl("http://127.example.com")).toBe(false);
    expect(parseEnv({}).seedDemo).toBe(true);
    expect(parseEnv({ APP_URL: "http://127.0.0.1:3210" }).seedDemo).toBe(true);
    const publicDefault = parseEnv({ APP_URL: "https://portolan.example" });
    expect(publicDefault.seedDemo).toBe(false);
    expect(publicDefault.demoOnPublicAddress).toBe(false);
    const forced = parseEnv({ APP_URL: "https://portolan.example", SEED_DEMO: "1" });
    expect(forced.seedDemo).toBe(true);
    expect(forced.demoOnPublicAddress).toBe(true);
    expect(parseEnv({ SEED_DEMO: "0" }).seedDemo).toBe(false);
  });

  it("TRUST_PROXY is a small number of hops", () => {
    expect(parseEnv({}).trustProxyHops).toBe(0);
    expect(parseEnv({ TRUST_PROXY: "2" }).trustProxyHops).toBe(2);
    expect(parseEnv({ TRUST_PROXY: "2" }).originPolicy.trustProxyHops).toBe(2);
    expect(() => parseEnv({ TRUST_PROXY: "many" })).toThrow(/TRUST_PROXY/);
    expect(() => parseEnv({ TRUST_PROXY: "-1" })).toThrow(/TRUST_PROXY/);
  });
});
