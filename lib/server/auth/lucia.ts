import "server-only";
import { DrizzleSQLiteAdapter } from "@lucia-auth/adapter-drizzle";
import { Lucia, TimeSpan, type DatabaseSession, type DatabaseUser } from "lucia";
import { sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { sessions, users } from "@/db/schema";
import { getEnv } from "@/lib/base/env";

export const SESSION_COOKIE_NAME = "portolan_session";

/**
 * The stock adapter, except the lookup every signed-in request makes: one statement for the session and
 * the few user columns the app reads (the stock one runs two, through the query builder, and reads every
 * user column, the password hash included). Half the cost of a session check (tests/bench/api.ts).
 */
class SessionAdapter extends DrizzleSQLiteAdapter {
  override async getSessionAndUser(sessionId: string): Promise<[session: DatabaseSession | null, user: DatabaseUser | null]> {
    const rows = await getDb().values<[string, number, string, string, number]>(sql`
      select ${sessions.userId}, ${sessions.expiresAt}, ${users.email}, ${users.name}, ${users.isSiteAdmin}
      from ${sessions} inner join ${users} on ${users.id} = ${sessions.userId}
      where ${sessions.id} = ${sessionId}`);
    if (rows.length !== 1) return [null, null];
    const row = rows[0];
    return [
      { id: sessionId, userId: row[0], expiresAt: new Date(Number(row[1]) * 1000), attributes: {} },
      { id: row[0], attributes: { email: row[2], name: row[3], isSiteAdmin: Boolean(row[4]) } },
    ];
  }
}

function createLucia() {
  const adapter = new SessionAdapter(getDb(), sessions, users);
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
