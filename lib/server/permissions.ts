import "server-only";
import { and, eq } from "drizzle-orm";
import { db, type Executor } from "@/db/client";
import { memberships, projects } from "@/db/schema";
import { AppError } from "@/lib/base/errors";
import { can, lowerRole, READ_ONLY_ACTIONS, type Action, type Role } from "@/lib/base/permission-table";
import { currentTokenScope } from "@/lib/server/auth/token-scope";

export { ACTIONS, PERMISSIONS, can } from "@/lib/base/permission-table";
export type { Action, Role } from "@/lib/base/permission-table";

/**
 * The user's role in the project, or null when they are not a member (or the project does not exist).
 * Under a personal API token: null outside the token's projects, and at most the token's ceiling (a
 * read-only token counts as reviewer here; authorize() also limits it to READ_ONLY_ACTIONS).
 */
export async function getRole({ userId, projectId, executor = db }: { userId: string; projectId: string; executor?: Executor }): Promise<Role | null> {
  const scope = currentTokenScope();
  if (scope && !scope.projectIds.includes(projectId)) return null;
  const role = await getMemberRole({ userId, projectId, executor });
  if (!role || !scope) return role;
  return lowerRole(role, scope.ceiling === "read" ? "reviewer" : scope.ceiling);
}

async function getMemberRole({ userId, projectId, executor }: { userId: string; projectId: string; executor: Executor }): Promise<Role | null> {
  const rows = await executor
    .select({ role: memberships.role })
    .from(memberships)
    .innerJoin(projects, eq(projects.id, memberships.projectId))
    .where(and(eq(memberships.userId, userId), eq(memberships.projectId, projectId)))
    .limit(1);
  return rows[0]?.role ?? null;
}

/**
 * Check on the server that `userId` may do `action` in `projectId` and return their role.
 * Throws 404 when the user is not a member, so a project's existence is not revealed, and 403 when
 * the user is a member whose role does not allow the action.
 */
export async function authorize({
  userId,
  projectId,
  action,
  executor,
}: {
  userId: string;
  projectId: string;
  action: Action;
  executor?: Executor;
}): Promise<Role> {
  const role = await getRole({ userId, projectId, executor });
  if (!role) throw new AppError("not_found", 404, "Project not found.");
  if (!can(role, action)) {
    throw new AppError("forbidden", 403, `Your role (${role}) does not allow this (${action}).`);
  }
  if (currentTokenScope()?.ceiling === "read" && !READ_ONLY_ACTIONS.has(action)) {
    throw new AppError("forbidden", 403, `This API token is read-only and does not allow this (${action}).`);
  }
  return role;
}
