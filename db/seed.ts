import "server-only";
import { randomUUID } from "node:crypto";
import { and, eq, inArray } from "drizzle-orm";
import { runInTransaction } from "./client";
import { memberships, projects, users, type Role } from "./schema";
import { recordAudit } from "@/lib/server/audit";
import { hashPassword } from "@/lib/server/auth/password";
import { seedDemoScenarios, type DemoSeedContext } from "./seed-scenarios";

export const DEMO_PASSWORD = "portolan-demo";

export const DEMO_USERS = [
  { email: "olive@portolan.example", name: "Olive Owner", role: "owner" },
  { email: "emil@portolan.example", name: "Emil Engineer", role: "engineer" },
  { email: "rhea@portolan.example", name: "Rhea Reviewer", role: "reviewer" },
] as const satisfies readonly { email: string; name: string; role: Role }[];

export const DEMO_PROJECT = {
  name: "Kestrel telemetry front end",
  description:
    "Front end of the Kestrel telemetry radio (an invented system): one transmitter and one receiver sharing two antennas through a T/R switch and an antenna switch, with band-pass filters, a monitor coupler and a low-noise amplifier. The question is whether enough of the transmit power stays out of the receiver in every switch setting.",
};

/**
 * Create the demo users and project once. Idempotent: does nothing if the demo project exists or if
 * any of the demo e-mails is already taken. Demo users are never site admins: their password is
 * published, so the first real account to sign up becomes site admin instead. The demo scenarios, parts
 * and rules follow in the same transaction (db/seed-scenarios.ts).
 */
export async function seedDemo(): Promise<{ seeded: boolean; projectId: string | null }> {
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  return runInTransaction(async (tx) => {
    const [existingProject] = await tx.select({ id: projects.id }).from(projects).where(eq(projects.name, DEMO_PROJECT.name)).limit(1);
    if (existingProject) return { seeded: false, projectId: existingProject.id };
    for (const demo of DEMO_USERS) {
      const [taken] = await tx.select({ id: users.id }).from(users).where(eq(users.email, demo.email));
      if (taken) return { seeded: false, projectId: null };
    }
    const ids = {} as DemoSeedContext["users"];
    for (const demo of DEMO_USERS) {
      const id = randomUUID();
      await tx.insert(users).values({ id, email: demo.email, name: demo.name, passwordHash, isSiteAdmin: false });
      ids[demo.role] = id;
    }
    const projectId = randomUUID();
    await tx.insert(projects).values({ id: projectId, name: DEMO_PROJECT.name, description: DEMO_PROJECT.description, createdBy: ids.owner });
    for (const demo of DEMO_USERS) {
      await tx.insert(memberships).values({ projectId, userId: ids[demo.role], role: demo.role });
    }
    await recordAudit(tx, { actor: null, projectId, action: "demo.seed", target: DEMO_PROJECT.name });
    await seedDemoScenarios({ tx, projectId, users: ids });
    return { seeded: true, projectId };
  });
}

/**
 * Databases seeded before demo users stopped being site admins may still have Olive as one: take it away
 * at start (the demo password is published). With no site admin left, the next real account to sign up
 * becomes one, as on a fresh database. Returns the e-mails demoted.
 */
export async function revokeDemoSiteAdmins(): Promise<string[]> {
  const emails = DEMO_USERS.map((demo) => demo.email as string);
  return runInTransaction(async (tx) => {
    const admins = await tx
      .select({ id: users.id, email: users.email })
      .from(users)
      .where(and(inArray(users.email, emails), eq(users.isSiteAdmin, true)));
    for (const admin of admins) {
      await tx.update(users).set({ isSiteAdmin: false }).where(eq(users.id, admin.id));
      await recordAudit(tx, { actor: null, action: "user.revoke_admin", target: admin.email, detail: { reason: "demo account" } });
    }
    return admins.map((admin) => admin.email);
  });
}

