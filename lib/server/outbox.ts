import "server-only";
import { getEnv } from "@/lib/base/env";
import { AppError } from "@/lib/base/errors";
import type { SessionUser } from "@/lib/server/auth/session";

/** The development outbox exists outside production, or in production when OUTBOX_ENABLED is set. */
export function isOutboxAvailable(): boolean {
  return getEnv().outboxEnabled;
}

/** Site admins only; 404 when the outbox is switched off so its existence is not advertised. */
export function assertOutboxAccess(user: SessionUser): void {
  if (!isOutboxAvailable()) throw new AppError("not_found", 404, "Not found.");
  if (!user.isSiteAdmin) throw new AppError("forbidden", 403, "Only site admins can read the outbox.");
}
