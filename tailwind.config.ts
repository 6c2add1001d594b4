import type { Config } from "tailwindcss";

// Colours point at CSS variables (app/globals.css) so one class name works in light and dark mode.
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}", "./lib/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        paper: "var(--pt-paper)",
        surface: "var(--pt-surface)",
        sunken: "var(--pt-sunken)",
        ink: "var(--pt-ink)",
        muted: "var(--pt-muted)",
        rule: "var(--pt-rule)",
        "rule-strong": "var(--pt-rule-strong)",
        pass: "var(--pt-pass)",
        fail: "var(--pt-fail)",
        warn: "var(--pt-warn)",
        sea: "var(--pt-sea)",
        focus: "var(--pt-focus)",
        "on-ink": "var(--pt-on-ink)",
        "on-fail": "var(--pt-on-fail)",
        "pass-strong": "var(--pt-pass-strong)",
        "fail-strong": "var(--pt-fail-strong)",
        "warn-strong": "var(--pt-warn-strong)",
        night: "#121A24",
        parchment: "#EAE2CF",
      },
      fontFamily: {
        sans: ["var(--font-sans)", "ui-sans-serif", "system-ui", "sans-serif"],
        mono: ["var(--font-mono)", "ui-monospace", "SFMono-Regular", "Menlo", "monospace"],
      },
      borderRadius: {
        card: "0.375rem",
      },
    },
  },
};

export default config;
