import "server-only";
import { randomUUID } from "node:crypto";
import { asc, count, eq } from "drizzle-orm";
import { db, runInTransaction, type Executor } from "@/db/client";
import { users, type User } from "@/db/schema";
import { recordAudit, type AuditActor } from "@/lib/server/audit";
import { AppError } from "@/lib/base/errors";

/** What may leave the server about a user: never the password hash. */
export type PublicUser = Pick<User, "id" | "email" | "name" | "isSiteAdmin" | "notifySignoff" | "deactivatedAt" | "createdAt">;

const publicColumns = {
  id: users.id,
  email: users.email,
  name: users.name,
  isSiteAdmin: users.isSiteAdmin,
  notifySignoff: users.notifySignoff,
  deactivatedAt: users.deactivatedAt,
  createdAt: users.createdAt,
};

export function normaliseEmail(email: string): string {
  return email.trim().toLowerCase();
}

/** Full row including the password hash: for sign-in only. */
export async function getUserWithPasswordByEmail({ email, executor = db }: { email: string; executor?: Executor }): Promise<User | null> {
  const [row] = await executor.select().from(users).where(eq(users.email, normaliseEmail(email)));
  return row ?? null;
}

export async function getUserByEmail({ email, executor = db }: { email: string; executor?: Executor }): Promise<PublicUser | null> {
  const [row] = await executor.select(publicColumns).from(users).where(eq(users.email, normaliseEmail(email)));
  return row ?? null;
}

export async function getUserById({ userId, executor = db }: { userId: string; executor?: Executor }): Promise<PublicUser | null> {
  const [row] = await executor.select(publicColumns).from(users).where(eq(users.id, userId));
  return row ?? null;
}

export async function countUsers({ executor = db }: { executor?: Executor } = {}): Promise<number> {
  const [row] = await executor.select({ n: count() }).from(users);
  return row?.n ?? 0;
}

export async function listUsers(): Promise<PublicUser[]> {
  return db.select(publicColumns).from(users).orderBy(asc(users.email));
}

/** Whether any account is site admin (demo accounts never are, so the first real account becomes one). */
export async function hasSiteAdmin({ executor = db }: { executor?: Executor } = {}): Promise<boolean> {
  const [row] = await executor.select({ id: users.id }).from(users).where(eq(users.isSiteAdmin, true)).limit(1);
  return Boolean(row);
}

/**
 * Insert an account. The first account made while no site admin exists becomes site admin (demo
 * accounts are never site admins, so on a demo database that is the first real sign-up). Throws 409 if the e-mail is taken.
 * Call inside a transaction so the first-account check and the insert cannot interleave.
 */
export async function insertUser({
  email,
  name,
  passwordHash,
  executor,
  forceSiteAdmin,
}: {
  email: string;
  name: string;
  passwordHash: string;
  executor: Executor;
  forceSiteAdmin?: boolean;
}): Promise<PublicUser> {
  const normalised = normaliseEmail(email);
  const existing = await getUserByEmail({ email: normalised, executor });
  if (existing) throw new AppError("conflict", 409, "An account with this e-mail already exists.", { email: "An account with this e-mail already exists." });
  const isFirst = !(await hasSiteAdmin({ executor }));
  const id = randomUUID();
  await executor.insert(users).values({ id, email: normalised, name, passwordHash, isSiteAdmin: forceSiteAdmin ?? isFirst });
  const created = await getUserById({ userId: id, executor });
  if (!created) throw new Error("user vanished after insert");
  await recordAudit(executor, { actor: { id, email: normalised }, action: "user.sign_up", target: normalised, detail: { siteAdmin: created.isSiteAdmin } });
  return created;
}

export async function updatePasswordHash({ userId, passwordHash, executor }: { userId: string; passwordHash: string; executor: Executor }): Promise<void> {
  await executor.update(users).set({ passwordHash }).where(eq(users.id, userId));
}

/** Grant or revoke site admin. The last site admin cannot be revoked (409). */
export async function setSiteAdmin({ userId, isSiteAdmin, actor }: { userId: string; isSiteAdmin: boolean; actor: AuditActor }): Promise<PublicUser> {
  return runInTransaction(async (tx) => {
    const target = await getUserById({ userId, executor: tx });
    if (!target) throw new AppError("not_found", 404, "User not found.");
    if (target.isSiteAdmin && !isSiteAdmin) {
      const [row] = await tx.select({ n: count() }).from(users).where(eq(users.isSiteAdmin, true));
      if ((row?.n ?? 0) <= 1) throw new AppError("conflict", 409, "Portolan needs at least one site admin.");
    }
    await tx.update(users).set({ isSiteAdmin }).where(eq(users.id, userId));
    await recordAudit(tx, { actor, action: isSiteAdmin ? "user.grant_admin" : "user.revoke_admin", target: target.email });
    const updated = await getUserById({ userId, executor: tx });
    if (!updated) throw new Error("user vanished after update");
    return updated;
  });
}
