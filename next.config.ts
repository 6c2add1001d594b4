import type { NextConfig } from "next";
import { API_CONTENT_SECURITY_POLICY, STATIC_SECURITY_HEADERS } from "./lib/base/security-headers";

const nextConfig: NextConfig = {
  // No "X-Powered-By: Next.js": it only tells an attacker what to try.
  poweredByHeader: false,
  serverExternalPackages: ["@libsql/client", "@node-rs/argon2", "smtp-server", "nodemailer", "piscina", "bullmq", "ioredis"],
  experimental: {
    serverActions: { bodySizeLimit: "2mb" },
  },
  // What the proxy skips still gets the security headers (proxy.ts sets them, with a nonce'd CSP, on
  // pages): the API its fixed deny-all CSP, the hashed static files the plain ones.
  async headers() {
    return [
      { source: "/api", headers: [{ key: "Content-Security-Policy", value: API_CONTENT_SECURITY_POLICY }, ...STATIC_SECURITY_HEADERS] },
      { source: "/api/:path*", headers: [{ key: "Content-Security-Policy", value: API_CONTENT_SECURITY_POLICY }, ...STATIC_SECURITY_HEADERS] },
      { source: "/_next/static/:path*", headers: [...STATIC_SECURITY_HEADERS] },
    ];
  },
};

export default nextConfig;
