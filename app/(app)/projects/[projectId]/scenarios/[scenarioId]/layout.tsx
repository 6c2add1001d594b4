import type { ReactNode } from "react";
import { loadScenarioPage } from "./load-scenario";

/**
 * Resolves the scenario before anything streams: a bad or foreign scenario id is then an HTTP 404.
 * (In the page, behind this segment's loading boundary, notFound() would come after a 200 was sent.)
 */
export default async function ScenarioLayout({ children, params }: { children: ReactNode; params: Promise<{ projectId: string; scenarioId: string }> }) {
  const { projectId, scenarioId } = await params;
  await loadScenarioPage(projectId, scenarioId);
  return children;
}
