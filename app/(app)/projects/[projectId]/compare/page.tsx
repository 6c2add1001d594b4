import type { Metadata } from "next";
import { listScenarios } from "@/db/queries/scenarios";
import { CompareView } from "@/components/compare/compare-view";
import { can } from "@/lib/base/permission-table";
import { loadProject } from "../load-project";

export const metadata: Metadata = { title: "Compare" };

type Search = { a?: string; b?: string; ra?: string; rb?: string };

export default async function ComparePage({ params, searchParams }: { params: Promise<{ projectId: string }>; searchParams: Promise<Search> }) {
  const { projectId } = await params;
  const search = await searchParams;
  const { user, project } = await loadProject(projectId);
  const scenarios = (await listScenarios({ userId: user.id, projectId })).map((s) => ({ id: s.id, name: s.name }));
  const known = (id: string | undefined) => (id && scenarios.some((s) => s.id === id) ? id : undefined);
  const a = known(search.a) ?? scenarios[0]?.id;
  const b = known(search.b) ?? scenarios.find((s) => s.id !== a)?.id ?? a;
  return (
    <section aria-labelledby="compare-heading" className="flex flex-col gap-4">
      <div>
        <h2 id="compare-heading" className="text-lg font-semibold">
          Compare
        </h2>
        <p className="max-w-prose text-sm text-muted">
          Two scenarios, or two revisions of one, side by side: every rule’s verdict and margin, each side judged by its own current rules (a stored “all rules” run that is
          current for the revision, its rules and the engine, run now if there is none), a transmission of your choice overlaid, and what differs in blocks, rules, links and
          system ports.
        </p>
      </div>
      {!a || !b ? (
        <p className="text-sm text-muted">This project has no scenarios to compare yet.</p>
      ) : (
        <CompareView
          projectId={project.id}
          scenarios={scenarios}
          canRun={can(project.role, "check.run")}
          initial={{ a: { scenarioId: a, revisionId: search.ra ?? "" }, b: { scenarioId: b, revisionId: search.rb ?? "" } }}
        />
      )}
    </section>
  );
}
