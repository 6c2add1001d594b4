import { describe, expect, it } from "vitest";
import { parseEnv } from "@/lib/base/env";
import { safeNextPath } from "@/lib/server/actions";

// The defaults documented for operators (issue 2, "Configuration"): development runs a local fake SMTP
// server and the outbox; production uses a real SMTP_URL, hides the outbox and sets Secure cookies.
describe("environment", () => {
  it("development defaults: local database file, fake SMTP on 2525, outbox on, cookies not Secure, demo seed on", () => {
    const env = parseEnv({ NODE_ENV: "development" });
    expect(env.databaseUrl).toBe("file:data/portolan.db");
    expect(env.smtpUrl).toBe("smtp://127.0.0.1:2525");
    expect(env.fakeSmtp).toBe(true);
    expect(env.outboxEnabled).toBe(true);
    expect(env.cookieSecure).toBe(false);
    expect(env.seedDemo).toBe(true);
    expect(env.signupMode).toBe("open");
    expect(env.appUrl).toBe("http://localhost:3000");
  });

  it("production with a real SMTP server: no fake server, no outbox, Secure cookies", () => {
    const env = parseEnv({ NODE_ENV: "production", SMTP_URL: "smtps://user:pw@mail.example:465" });
    expect(env.fakeSmtp).toBe(false);
    expect(env.outboxEnabled).toBe(false);
    expect(env.cookieSecure).toBe(true);
  });

  it("production without SMTP_URL still runs the fake server; OUTBOX_ENABLED and COOKIE_SECURE=false are honoured", () => {
    const env = parseEnv({ NODE_ENV: "production", OUTBOX_ENABLED: "1", COOKIE_SECURE: "false", SEED_DEMO: "0", FAKE_SMTP_PORT: "2626" });
    expect(env.fakeSmtp).toBe(true);
    expect(env.smtpUrl).toBe("smtp://127.0.0.1:2626");
    expect(env.outboxEnabled).toBe(true);
    expect(env.cookieSecure).toBe(false);
    expect(env.seedDemo).toBe(false);
  });

  it("accepts a libSQL server URL with a token, and APP_URL for links", () => {
    const env = parseEnv({ DATABASE_URL: "libsql://portolan-team.example:8080", DATABASE_AUTH_TOKEN: "t0ken", APP_URL: "https://portolan.example/" });
    expect(env.databaseUrl).toBe("libsql://portolan-team.example:8080");
    expect(env.databaseAuthToken).toBe("t0ken");
    expect(env.appUrl).toBe("https://portolan.example");
    expect(env.appOrigin).toBe("https://portolan.example");
  });

  it("refuses nonsense with the variable's name", () => {
    expect(() => parseEnv({ DATABASE_URL: "postgres://x" })).toThrow(/DATABASE_URL/);
    expect(() => parseEnv({ SIGNUP_MODE: "closed" })).toThrow(/SIGNUP_MODE/);
    expect(() => parseEnv({ FAKE_SMTP_PORT: "70000" })).toThrow(/FAKE_SMTP_PORT/);
    expect(() => parseEnv({ COOKIE_SECURE: "maybe" })).toThrow(/COOKIE_SECURE/);
  });
});

describe("after sign-in, go only to a path on this site", () => {
  it("keeps relative paths and refuses other hosts", () => {
    expect(safeNextPath("/invite/abc")).toBe("/invite/abc");
    expect(safeNextPath("//evil.example/x")).toBe("/projects");
    expect(safeNextPath("/\\evil.example")).toBe("/projects");
    expect(safeNextPath("https://evil.example")).toBe("/projects");
    expect(safeNextPath(null)).toBe("/projects");
  });
});
