import "server-only";
import { cache } from "react";
import { notFound } from "next/navigation";
import { getProjectForUser, type ProjectWithRole } from "@/db/queries/projects";
import { requireUser, type SessionUser } from "@/lib/server/auth/session";
import { isAppError } from "@/lib/base/errors";

/** The project and the viewer's role for pages under /projects/[projectId]; a 404 page unless a member. */
export const loadProject = cache(async (projectId: string): Promise<{ user: SessionUser; project: ProjectWithRole }> => {
  const user = await requireUser();
  try {
    return { user, project: await getProjectForUser({ projectId, userId: user.id }) };
  } catch (error) {
    if (isAppError(error) && error.status === 404) notFound();
    throw error;
  }
});
