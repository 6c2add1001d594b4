import "server-only";
import { notFound } from "next/navigation";
import { cache } from "react";
import { loadScenario } from "@/db/queries/scenarios";
import { isAppError } from "@/lib/base/errors";
import { loadProject } from "../../load-project";

/**
 * The scenario with its latest revision, loaded once per request for the title and the page. The
 * project layout has resolved the viewer's membership (loadProject); its role is the access.
 */
export const loadScenarioPage = cache(async (projectId: string, scenarioId: string) => {
  const { user, project } = await loadProject(projectId);
  try {
    return { user, project, ...(await loadScenario({ userId: user.id, projectId, role: project.role }, { scenarioId })) };
  } catch (error) {
    if (isAppError(error) && error.status === 404) notFound();
    throw error;
  }
});

