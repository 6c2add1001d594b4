import "server-only";
import { eq } from "drizzle-orm";
import { db, type Executor } from "@/db/client";
import { settings } from "@/db/schema";
import { getEnv } from "@/lib/base/env";
import { recordAudit, type AuditActor } from "@/lib/server/audit";
import type { SignupMode } from "@/lib/base/validation/admin";

const SIGNUP_MODE_KEY = "signup_mode";

/** Open or invitation-only sign-up: the database setting, else SIGNUP_MODE from the environment. */
export async function getSignupMode({ executor = db }: { executor?: Executor } = {}): Promise<SignupMode> {
  const [row] = await executor.select().from(settings).where(eq(settings.key, SIGNUP_MODE_KEY));
  if (row?.value === "open" || row?.value === "invite") return row.value;
  return getEnv().signupMode;
}

export async function setSignupMode({ mode, actor, executor }: { mode: SignupMode; actor: AuditActor; executor: Executor }): Promise<void> {
  await executor
    .insert(settings)
    .values({ key: SIGNUP_MODE_KEY, value: mode, updatedAt: new Date() })
    .onConflictDoUpdate({ target: settings.key, set: { value: mode, updatedAt: new Date() } });
  await recordAudit(executor, { actor, action: "settings.signup_mode", target: mode });
}
