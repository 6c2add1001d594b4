import type { Metadata, Viewport } from "next";
import localFont from "next/font/local";
import { headers } from "next/headers";
import type { ReactNode } from "react";
import { themeBootScript } from "@/components/shell/theme-script";
import { getEnv } from "@/lib/base/env";
import "./globals.css";

// Fonts ship with the app (copied from @fontsource, SIL Open Font License; see app/fonts/LICENSE-*.txt).
const sans = localFont({
  src: [
    { path: "./fonts/instrument-sans-latin-400-normal.woff2", weight: "400", style: "normal" },
    { path: "./fonts/instrument-sans-latin-500-normal.woff2", weight: "500", style: "normal" },
    { path: "./fonts/instrument-sans-latin-600-normal.woff2", weight: "600", style: "normal" },
    { path: "./fonts/instrument-sans-latin-700-normal.woff2", weight: "700", style: "normal" },
  ],
  variable: "--font-sans",
  display: "swap",
  fallback: ["ui-sans-serif", "system-ui", "sans-serif"],
});

const mono = localFont({
  src: [
    { path: "./fonts/jetbrains-mono-latin-400-normal.woff2", weight: "400", style: "normal" },
    { path: "./fonts/jetbrains-mono-latin-600-normal.woff2", weight: "600", style: "normal" },
  ],
  variable: "--font-mono",
  display: "swap",
  fallback: ["ui-monospace", "monospace"],
});

// zod probes for eval (`Function("")`) the first time it parses an object, to compile faster parsers. The
// CSP forbids eval, so the probe would be reported as a violation; say up front that it must not compile.
const zodJitlessScript = `globalThis.__zod_globalConfig=Object.assign(globalThis.__zod_globalConfig||{},{jitless:true})`;

export const metadata: Metadata = {
  title: { default: "Portolan", template: "%s · Portolan" },
  description: "Integration checks for RF front ends built from N-port parts: isolation, match, leak paths, power and drive levels.",
  applicationName: "Portolan",
  // favicon.ico (16, 32, 48 px; scripts/make-favicon.mjs) for browsers that ask for it, the SVG for those that scale
  icons: { icon: [{ url: "/favicon.ico", sizes: "16x16 32x32 48x48" }, { url: "/icon.svg", type: "image/svg+xml" }], apple: "/icon-192.png" },
};

export const viewport: Viewport = {
  themeColor: [
    { media: "(prefers-color-scheme: light)", color: "#F4EFE2" },
    { media: "(prefers-color-scheme: dark)", color: "#121A24" },
  ],
};

export default async function RootLayout({ children }: { children: ReactNode }) {
  // proxy.ts makes a nonce per request; the Content-Security-Policy runs only scripts that carry it.
  const nonce = (await headers()).get("x-nonce") ?? undefined;
  const env = getEnv();
  return (
    <html lang="en" className={`${sans.variable} ${mono.variable}`} suppressHydrationWarning>
      <head>
        <script nonce={nonce} dangerouslySetInnerHTML={{ __html: themeBootScript }} />
        <script nonce={nonce} dangerouslySetInnerHTML={{ __html: zodJitlessScript }} />
      </head>
      <body className="bg-paper font-sans text-ink antialiased">
        {env.demoOnPublicAddress ? (
          <div role="alert" className="bg-fail px-4 py-2 text-center text-sm font-semibold text-on-fail">
            Demo accounts are on (SEED_DEMO=1) at {env.appUrl}: their password is published. Remove SEED_DEMO and delete the demo accounts before real use.
          </div>
        ) : null}
        {children}
      </body>
    </html>
  );
}
