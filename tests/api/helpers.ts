// Test set-up for the API tests: a fresh SQLite file per test file, route handlers called directly.
// Importing this module first sets DATABASE_URL (and SMTP_URL) before anything opens the database.
import { mkdtempSync } from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import { count } from "drizzle-orm";
import type { SQLiteTable } from "drizzle-orm/sqlite-core";

const dir = mkdtempSync(path.join(os.tmpdir(), "portolan-api-"));
process.env.DATABASE_URL = `file:${path.join(dir, "test.db")}`;
process.env.SEED_DEMO = "0";
process.env.FAKE_SMTP = "0";
process.env.APP_URL = "http://localhost:3000";
delete process.env.APP_ORIGIN;
delete process.env.SIGNUP_MODE;

/** A TCP port nobody is listening on right now. */
export function findFreePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const address = server.address();
      const port = typeof address === "object" && address ? address.port : 0;
      server.close(() => resolve(port));
    });
  });
}

// Mail goes to a fake SMTP server on a random port; tests that read mail start it with startMailCatcher().
export const SMTP_PORT = await findFreePort();
process.env.SMTP_URL = `smtp://127.0.0.1:${SMTP_PORT}`;
process.env.FAKE_SMTP_PORT = String(SMTP_PORT);

export const ORIGIN = "http://localhost:3000";
export const HOST = "localhost:3000";

/** Apply the migrations to this file's fresh database. */
export async function setUpDatabase(): Promise<void> {
  const { migrateDatabase } = await import("@/db/migrate");
  await migrateDatabase();
}

/** Start the fake SMTP server of lib/server/mail on this file's port. */
export async function startMailCatcher() {
  const { startFakeSmtpServer } = await import("@/lib/server/mail/fake-smtp");
  return startFakeSmtpServer({ port: SMTP_PORT });
}

export type RequestOptions = {
  body?: unknown;
  /** Sent as-is (use to send broken JSON). */
  rawBody?: string;
  cookie?: string | null;
  /** Origin header; `null` sends none. Defaults to the app's own origin. */
  origin?: string | null;
  headers?: Record<string, string>;
};

/** A Request as a browser on the app's own origin would send it. */
export function makeRequest(method: string, pathname: string, options: RequestOptions = {}): Request {
  const headers = new Headers({ host: HOST, ...options.headers });
  if (options.origin !== null) headers.set("origin", options.origin ?? ORIGIN);
  if (options.cookie) headers.set("cookie", options.cookie);
  let body: string | undefined;
  if (options.rawBody !== undefined) body = options.rawBody;
  else if (options.body !== undefined) body = JSON.stringify(options.body);
  if (body !== undefined && !headers.has("content-type")) headers.set("content-type", "application/json");
  return new Request(`http://${HOST}${pathname}`, { method, headers, body });
}

type Handler = (request: Request, context?: { params: Promise<Record<string, string>> }) => Promise<Response>;

/** Call a route handler with params the way Next.js does. */
export async function call(handler: Handler, request: Request, params: Record<string, string> = {}): Promise<Response> {
  return handler(request, { params: Promise.resolve(params) });
}

/** The `name=value` pair of the session cookie in a response, for the next request's Cookie header. */
export function sessionCookieFrom(response: Response): string | null {
  for (const header of response.headers.getSetCookie()) {
    const pair = header.split(";")[0];
    if (pair.startsWith("portolan_session=") && pair !== "portolan_session=") return pair;
  }
  return null;
}

/** Create an account directly (bypassing the API) and return its id and a session cookie. */
export async function createAccount({ email, name = email.split("@")[0], password = "correct horse battery" }: { email: string; name?: string; password?: string }) {
  const { signUp } = await import("@/lib/server/auth/accounts");
  const { user, token } = await signUp({ email, name, password, viaInvitation: true });
  return { user, password, cookie: `portolan_session=${token}` };
}

/** Number of rows in a table. */
export async function countRows(table: SQLiteTable): Promise<number> {
  const { db } = await import("@/db/client");
  const [row] = await db.select({ n: count() }).from(table);
  return row?.n ?? 0;
}

export type ErrorJson = { error: { code: string; message: string; fields?: Record<string, string> } };

/** Wait until `check` returns a value (mail arrives asynchronously). */
export async function waitFor<T>(check: () => Promise<T | null | undefined>, timeoutMs = 5000): Promise<T> {
  const start = Date.now();
  for (;;) {
    const value = await check();
    if (value) return value;
    if (Date.now() - start > timeoutMs) throw new Error("timed out waiting");
    await new Promise((resolve) => setTimeout(resolve, 25));
  }
}
