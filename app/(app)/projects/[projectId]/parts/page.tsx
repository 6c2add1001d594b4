import type { Metadata } from "next";
import { listParts } from "@/db/queries/parts";
import { PartsLibrary } from "@/components/parts/parts-library";
import type { PartView } from "@/lib/domain/parts/types";
import { serialiseDates } from "@/lib/domain/serialised";
import { can } from "@/lib/base/permission-table";
import { loadProject } from "../load-project";

export const metadata: Metadata = { title: "Parts" };

export default async function PartsPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { user, project } = await loadProject(projectId);
  const parts: PartView[] = serialiseDates(await listParts({ userId: user.id, projectId }));
  return (
    <section aria-labelledby="parts-heading" className="flex flex-col gap-4">
      <div>
        <h2 id="parts-heading" className="text-lg font-semibold">
          Parts
        </h2>
        <p className="max-w-prose text-sm text-muted">
          Touchstone data sets of this project. A part is placed on a chart as a block from the add-block list; its data is renormalised from its own reference impedances to the system Z0.
        </p>
      </div>
      <PartsLibrary projectId={project.id} initial={parts} canEdit={can(project.role, "part.upload")} />
    </section>
  );
}
