import "server-only";
import { randomUUID } from "node:crypto";
import { and, asc, eq } from "drizzle-orm";
import { db, runInTransaction } from "@/db/client";
import { memberships, projects, type Project, type Role } from "@/db/schema";
import { recordAudit } from "@/lib/server/audit";
import { AppError } from "@/lib/base/errors";
import { allow, authorize, getRole, type ProjectAccess } from "@/lib/server/permissions";
import type { SessionUser } from "@/lib/server/auth/session";

export type ProjectWithRole = Pick<Project, "id" | "name" | "description" | "createdAt" | "updatedAt"> & { role: Role };

const projectColumns = {
  id: projects.id,
  name: projects.name,
  description: projects.description,
  createdAt: projects.createdAt,
  updatedAt: projects.updatedAt,
};

/** Every project the user is a member of, with their role, by name. */
export async function listProjectsForUser({ userId }: { userId: string }): Promise<ProjectWithRole[]> {
  return db
    .select({ ...projectColumns, role: memberships.role })
    .from(memberships)
    .innerJoin(projects, eq(projects.id, memberships.projectId))
    .where(eq(memberships.userId, userId))
    .orderBy(asc(projects.name));
}

/** One project with the user's role; 404 unless the user is a member. */
export async function getProjectForUser({ projectId, userId }: { projectId: string; userId: string }): Promise<ProjectWithRole> {
  const [row] = await db
    .select({ ...projectColumns, role: memberships.role })
    .from(memberships)
    .innerJoin(projects, eq(projects.id, memberships.projectId))
    .where(and(eq(memberships.projectId, projectId), eq(memberships.userId, userId)));
  // getRole applies an API token's project scope and role ceiling (lib/server/auth/token-scope.ts).
  const role = row ? await getRole({ userId, projectId }) : null;
  if (!row || !role) throw new AppError("not_found", 404, "Project not found.");
  return { ...row, role };
}

/** One project with the role of access resolved by the caller (project.read is checked against it). */
export async function loadProject(access: ProjectAccess): Promise<ProjectWithRole> {
  const role = allow(access, "project.read");
  const [row] = await db.select(projectColumns).from(projects).where(eq(projects.id, access.projectId));
  if (!row) throw new AppError("not_found", 404, "Project not found.");
  return { ...row, role };
}

/** Any signed-in person may create a project and becomes its owner. */
export async function createProject({ actor, name, description }: { actor: SessionUser; name: string; description: string }): Promise<ProjectWithRole> {
  return runInTransaction(async (tx) => {
    const id = randomUUID();
    const now = new Date();
    await tx.insert(projects).values({ id, name, description, createdBy: actor.id, createdAt: now, updatedAt: now });
    await tx.insert(memberships).values({ projectId: id, userId: actor.id, role: "owner" });
    await recordAudit(tx, { actor, projectId: id, action: "project.create", target: name });
    return { id, name, description, createdAt: now, updatedAt: now, role: "owner" as const };
  });
}

export async function updateProject({
  actor,
  projectId,
  name,
  description,
}: {
  actor: SessionUser;
  projectId: string;
  name?: string;
  description?: string;
}): Promise<ProjectWithRole> {
  return runInTransaction(async (tx) => {
    const role = await authorize({ userId: actor.id, projectId, action: "project.rename", executor: tx });
    const [before] = await tx.select(projectColumns).from(projects).where(eq(projects.id, projectId));
    if (!before) throw new AppError("not_found", 404, "Project not found.");
    const changes: Partial<Project> = { updatedAt: new Date() };
    if (name !== undefined) changes.name = name;
    if (description !== undefined) changes.description = description;
    await tx.update(projects).set(changes).where(eq(projects.id, projectId));
    await recordAudit(tx, {
      actor,
      projectId,
      action: "project.update",
      target: name ?? before.name,
      detail: {
        ...(name !== undefined && name !== before.name ? { from: before.name, to: name } : {}),
        ...(description !== undefined && description !== before.description ? { descriptionChanged: true } : {}),
      },
    });
    const [after] = await tx.select(projectColumns).from(projects).where(eq(projects.id, projectId));
    return { ...after, role };
  });
}

/** Delete a project and everything in it (owners). The audit event survives with the project id cleared. */
export async function deleteProject({ actor, projectId, confirmName }: { actor: SessionUser; projectId: string; confirmName?: string }): Promise<void> {
  await runInTransaction(async (tx) => {
    await authorize({ userId: actor.id, projectId, action: "project.delete", executor: tx });
    const [project] = await tx.select(projectColumns).from(projects).where(eq(projects.id, projectId));
    if (!project) throw new AppError("not_found", 404, "Project not found.");
    if (confirmName !== undefined && confirmName.trim() !== project.name) {
      throw new AppError("validation_failed", 400, "Type the project name exactly to confirm.", {
        confirmName: "Type the project name exactly to confirm.",
      });
    }
    await recordAudit(tx, { actor, projectId: null, action: "project.delete", target: project.name, detail: { projectId } });
    await tx.delete(projects).where(eq(projects.id, projectId));
  });
}
