import type { NextConfig } from "next";

const nextConfig: NextConfig = {
  // No "X-Powered-By: Next.js": it only tells an attacker what to try.
  poweredByHeader: false,
  serverExternalPackages: ["@libsql/client", "@node-rs/argon2", "smtp-server", "nodemailer", "piscina", "bullmq", "ioredis"],
  experimental: {
    serverActions: { bodySizeLimit: "2mb" },
  },
  // The static files the proxy skips still get the plain security headers (proxy.ts sets them, and the CSP, elsewhere).
  async headers() {
    return [
      {
        source: "/_next/static/:path*",
        headers: [
          { key: "X-Content-Type-Options", value: "nosniff" },
          { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
        ],
      },
    ];
  },
};

export default nextConfig;
