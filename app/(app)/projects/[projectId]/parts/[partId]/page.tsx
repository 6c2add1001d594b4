import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { listPartVersions, partUses } from "@/db/queries/parts";
import { PartDetail } from "@/components/parts/part-detail";
import type { PartVersionView } from "@/lib/domain/parts/types";
import { serialiseDates } from "@/lib/domain/serialised";
import { can } from "@/lib/base/permission-table";
import { isAppError } from "@/lib/base/errors";
import { loadProject } from "../../load-project";

export const metadata: Metadata = { title: "Part" };

export default async function PartPage({ params }: { params: Promise<{ projectId: string; partId: string }> }) {
  const { projectId, partId } = await params;
  const { user, project } = await loadProject(projectId);
  let found: Awaited<ReturnType<typeof listPartVersions>>;
  try {
    found = await listPartVersions({ userId: user.id, projectId, partId });
  } catch (error) {
    if (isAppError(error) && error.status === 404) notFound();
    throw error;
  }
  // figures come from the columns stored at upload; the traces are drawn in the browser from the text
  const versions: PartVersionView[] = serialiseDates(found.versions);
  const uses = await partUses({ projectId, fileName: found.fileName });
  return <PartDetail projectId={project.id} partId={partId} fileName={found.fileName} initialVersions={versions} initialUses={uses} canEdit={can(project.role, "part.delete")} />;
}
