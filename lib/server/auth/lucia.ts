import "server-only";
import { DrizzleSQLiteAdapter } from "@lucia-auth/adapter-drizzle";
import { Lucia, TimeSpan } from "lucia";
import { getDb } from "@/db/client";
import { sessions, users } from "@/db/schema";
import { getEnv } from "@/lib/base/env";

export const SESSION_COOKIE_NAME = "portolan_session";

function createLucia() {
  const adapter = new DrizzleSQLiteAdapter(getDb(), sessions, users);
  return new Lucia(adapter, {
    // 30 days, extended whenever fewer than 15 days remain (sliding expiry).
    sessionExpiresIn: new TimeSpan(30, "d"),
    sessionCookie: {
      name: SESSION_COOKIE_NAME,
      attributes: { secure: getEnv().cookieSecure, sameSite: "lax" },
    },
    getUserAttributes: (attributes) => ({
      email: attributes.email,
      name: attributes.name,
      isSiteAdmin: attributes.isSiteAdmin,
    }),
  });
}

export type AppLucia = ReturnType<typeof createLucia>;

declare module "lucia" {
  interface Register {
    Lucia: AppLucia;
    DatabaseUserAttributes: {
      email: string;
      name: string;
      isSiteAdmin: boolean;
    };
  }
}

const globalForLucia = globalThis as unknown as { portolanLucia?: { lucia: AppLucia; db: unknown } };

export function getLucia(): AppLucia {
  const db = getDb();
  const existing = globalForLucia.portolanLucia;
  if (existing && existing.db === db) return existing.lucia;
  const lucia = createLucia();
  globalForLucia.portolanLucia = { lucia, db };
  return lucia;
}
