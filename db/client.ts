import "server-only";
import { mkdirSync } from "node:fs";
import path from "node:path";
import { createClient, type Client } from "@libsql/client";
import { drizzle, type LibSQLDatabase } from "drizzle-orm/libsql";
import { getEnv } from "@/lib/base/env";
import * as schema from "./schema";

export type Database = LibSQLDatabase<typeof schema>;
/** A transaction handle; queries accept either this or `db`. */
export type Transaction = Parameters<Parameters<Database["transaction"]>[0]>[0];
export type Executor = Database | Transaction;

type Holder = { client: Client; db: Database; url: string };
const globalForDb = globalThis as unknown as { portolanDb?: Holder };

/** Make sure the folder of a `file:` database exists (SQLite will not create it). */
export function ensureDatabaseFolder(url: string): void {
  if (!url.startsWith("file:")) return;
  const filePath = url.slice("file:".length).split("?")[0];
  if (!filePath || filePath === ":memory:") return;
  mkdirSync(path.dirname(path.resolve(filePath)), { recursive: true });
}

function open(): Holder {
  const env = getEnv();
  const existing = globalForDb.portolanDb;
  // Reused across dev reloads; a changed URL (tests) opens a new client.
  if (existing && existing.url === env.databaseUrl) return existing;
  ensureDatabaseFolder(env.databaseUrl);
  // A busy timeout lets concurrent writers (requests, or several app instances on one file) wait instead of failing.
  const client = createClient({ url: env.databaseUrl, authToken: env.databaseAuthToken, timeout: 5000 });
  const holder: Holder = { client, db: drizzle(client, { schema }), url: env.databaseUrl };
  globalForDb.portolanDb = holder;
  return holder;
}

/** The raw libSQL client (migrations, pragmas). */
export function getClient(): Client {
  return open().client;
}

/** The drizzle database, opened on first use. */
export function getDb(): Database {
  return open().db;
}

/** Lazily opened so importing this module (for example during `next build`) touches no database. */
export const db: Database = new Proxy({} as Database, {
  get(_target, key) {
    const real = getDb() as unknown as Record<PropertyKey, unknown>;
    const value = real[key];
    return typeof value === "function" ? (value as (...args: unknown[]) => unknown).bind(real) : value;
  },
});

/** Run `work` in one write transaction; every multi-step write and its audit event go through here. */
export function runInTransaction<T>(work: (tx: Transaction) => Promise<T>): Promise<T> {
  return getDb().transaction(work);
}
