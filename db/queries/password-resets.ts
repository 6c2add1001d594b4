import "server-only";
import { randomUUID } from "node:crypto";
import { and, eq, isNull } from "drizzle-orm";
import { db, type Executor } from "@/db/client";
import { passwordResets, type PasswordReset } from "@/db/schema";

export async function insertPasswordReset({ userId, tokenHash, expiresAt, executor = db }: { userId: string; tokenHash: string; expiresAt: Date; executor?: Executor }): Promise<void> {
  await executor.insert(passwordResets).values({ id: randomUUID(), userId, tokenHash, expiresAt });
}

export async function getPasswordResetByTokenHash({ tokenHash, executor = db }: { tokenHash: string; executor?: Executor }): Promise<PasswordReset | null> {
  const [row] = await executor.select().from(passwordResets).where(eq(passwordResets.tokenHash, tokenHash));
  return row ?? null;
}

/** Mark a reset used; returns false if another request used it first. Also retires the user's other open resets. */
export async function markPasswordResetUsed({ id, userId, now, executor }: { id: string; userId: string; now: Date; executor: Executor }): Promise<boolean> {
  const used = await executor
    .update(passwordResets)
    .set({ usedAt: now })
    .where(and(eq(passwordResets.id, id), isNull(passwordResets.usedAt)))
    .returning({ id: passwordResets.id });
  if (used.length === 0) return false;
  await executor.update(passwordResets).set({ usedAt: now }).where(and(eq(passwordResets.userId, userId), isNull(passwordResets.usedAt)));
  return true;
}
