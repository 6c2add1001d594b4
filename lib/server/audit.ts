import "server-only";
import { randomUUID } from "node:crypto";
import type { Executor } from "@/db/client";
import { auditEvents } from "@/db/schema";

export type AuditActor = { id: string; email: string } | null;

export type AuditInput = {
  actor: AuditActor;
  projectId?: string | null;
  /** Dotted verb, e.g. "project.rename", "member.role_change". */
  action: string;
  /** What was acted on, readable: an e-mail, a project name. */
  target?: string | null;
  detail?: Record<string, unknown>;
};

/** Write one audit event. Call it with the transaction of the mutation it records. */
export async function recordAudit(executor: Executor, input: AuditInput): Promise<void> {
  await executor.insert(auditEvents).values({
    id: randomUUID(),
    projectId: input.projectId ?? null,
    actorId: input.actor?.id ?? null,
    actorEmail: input.actor?.email ?? null,
    action: input.action,
    target: input.target ?? null,
    detail: input.detail ?? null,
  });
}
