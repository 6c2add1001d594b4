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
 * A member's access to one project, resolved once per use case: a route resolves it with
 * `resolveAccess` and hands it to the loaders it calls, which check their action against the role with
 * `allow` (no further query). Only `resolveAccess` makes one.
 */
export type ProjectAccess = { readonly userId: string; readonly projectId: string; readonly role: Role };

/** The user's access to the project. Throws 404 when they are not a member, so a project's existence is not revealed. */
export async function resolveAccess({ userId, projectId, executor }: { userId: string; projectId: string; executor?: Executor }): Promise<ProjectAccess> {
  const role = await getRole({ userId, projectId, executor });
  if (!role) throw new AppError("not_found", 404, "Project not found.");
  return { userId, projectId, role };
}

/** Check that resolved access allows `action` (403 otherwise) and return the role. */
export function allow(access: ProjectAccess, action: Action): Role {
  if (!can(access.role, action)) {
    throw new AppError("forbidden", 403, `Your role (${access.role}) does not allow this (${action}).`);
  }
  if (currentTokenScope()?.ceiling === "read" && !READ_ONLY_ACTIONS.has(action)) {
    throw new AppError("forbidden", 403, `This API token is read-only and does not allow this (${action}).`);
  }
  return access.role;
}

/**
 * Check on the server that `userId` may do `action` in `projectId` and return their role: 404 when the
 * user is not a member, 403 when their role does not allow the action (resolveAccess + allow).
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
  return allow(await resolveAccess({ userId, projectId, executor }), action);
}
