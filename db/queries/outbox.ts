import "server-only";
import { randomUUID } from "node:crypto";
import { desc, eq, sql } from "drizzle-orm";
import { db } from "@/db/client";
import { outboxMessages, type OutboxMessage } from "@/db/schema";

export type OutboxSummary = Pick<OutboxMessage, "id" | "fromAddress" | "toAddress" | "subject" | "receivedAt">;

export async function insertOutboxMessage(message: Omit<OutboxMessage, "id">): Promise<string> {
  const id = randomUUID();
  await db.insert(outboxMessages).values({ id, ...message });
  return id;
}

export async function listOutboxMessages({ limit = 200 }: { limit?: number } = {}): Promise<OutboxSummary[]> {
  return db
    .select({
      id: outboxMessages.id,
      fromAddress: outboxMessages.fromAddress,
      toAddress: outboxMessages.toAddress,
      subject: outboxMessages.subject,
      receivedAt: outboxMessages.receivedAt,
    })
    .from(outboxMessages)
    .orderBy(desc(outboxMessages.receivedAt), desc(sql`${outboxMessages}.rowid`))
    .limit(limit);
}

export async function getOutboxMessage({ messageId }: { messageId: string }): Promise<OutboxMessage | null> {
  const [row] = await db.select().from(outboxMessages).where(eq(outboxMessages.id, messageId));
  return row ?? null;
}
