import type { Role } from "@/db/schema";

export type { Role };

/**
 * Client-safe: components may import this file to hide controls; the server decides through lib/server/permissions.ts.
 *
 * Every project action and the roles allowed to do it: the one place where access is decided.
 * Reviewers read, run checks, export bundles and sign off; engineers also edit; owners also manage
 * members, rename the project, read the audit log and delete it.
 *
 * Site admins manage users and the sign-up setting (see `isSiteAdmin` checks in the admin routes) but do
 * NOT bypass this table: to see or change a project's content a site admin needs a membership like anyone.
 */
export const PERMISSIONS = {
  "project.read": ["owner", "engineer", "reviewer"],
  "project.rename": ["owner"],
  "project.delete": ["owner"],
  "members.read": ["owner", "engineer", "reviewer"],
  "members.manage": ["owner"],
  "audit.read": ["owner"],
  "scenario.read": ["owner", "engineer", "reviewer"],
  "scenario.create": ["owner", "engineer"],
  "scenario.edit": ["owner", "engineer"],
  "scenario.delete": ["owner", "engineer"],
  "part.read": ["owner", "engineer", "reviewer"],
  "part.upload": ["owner", "engineer"],
  "part.delete": ["owner", "engineer"],
  "rule.read": ["owner", "engineer", "reviewer"],
  "rule.edit": ["owner", "engineer"],
  "check.run": ["owner", "engineer", "reviewer"],
  "runs.clear": ["owner"],
  "bundle.export": ["owner", "engineer", "reviewer"],
  "bundle.import": ["owner", "engineer"],
  "signoff.read": ["owner", "engineer", "reviewer"],
  "signoff.request": ["owner", "engineer"],
  "signoff.decide": ["owner", "reviewer"],
} as const satisfies Record<string, readonly Role[]>;

export type Action = keyof typeof PERMISSIONS;

export const ACTIONS = Object.keys(PERMISSIONS) as Action[];

/** Whether `role` may do `action`. A missing role (not a member) may do nothing. */
export function can(role: Role | null | undefined, action: Action): boolean {
  if (!role) return false;
  return (PERMISSIONS[action] as readonly Role[]).includes(role);
}

/** Actions that change nothing: all a read-only API token may do. */
export const READ_ONLY_ACTIONS: ReadonlySet<Action> = new Set<Action>([
  "project.read",
  "members.read",
  "audit.read",
  "scenario.read",
  "part.read",
  "rule.read",
  "bundle.export",
  "signoff.read",
]);

const ROLE_RANK: Record<Role, number> = { reviewer: 1, engineer: 2, owner: 3 };

/** The lower of two roles (a token's ceiling against its owner's role in a project). */
export function lowerRole(a: Role, b: Role): Role {
  return ROLE_RANK[a] <= ROLE_RANK[b] ? a : b;
}
