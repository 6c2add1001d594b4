// Route handlers behind an https APP_URL add HSTS themselves (the API does not pass through proxy.ts,
// whose pages get it there; next.config.ts cannot know the scheme at build time). Issue 12 item 6.
import { beforeAll, expect, it } from "vitest";
import { call, makeRequest, setUpDatabase } from "./helpers";
import * as sessionRoute from "@/app/api/auth/session/route";
import { STRICT_TRANSPORT_SECURITY } from "@/lib/base/security-headers";

beforeAll(async () => {
  // before anything reads (and caches) the environment
  process.env.APP_URL = "https://portolan.example";
  await setUpDatabase();
});

it("an API answer over https carries Strict-Transport-Security (RFC 6797 §6.1), signed in or not", async () => {
  const response = await call(sessionRoute.GET, makeRequest("GET", "/api/auth/session", { origin: null }));
  expect(response.headers.get("strict-transport-security")).toBe(STRICT_TRANSPORT_SECURITY);
  expect(STRICT_TRANSPORT_SECURITY).toMatch(/^max-age=31536000\b/);
});
