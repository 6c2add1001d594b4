import type { Metadata } from "next";
import Link from "next/link";
import { ImportBundleForm } from "@/components/signoff/import-bundle-form";
import { SignoffStateBadge } from "@/components/signoff/signoff-state-badge";
import { STATE_LABELS } from "@/components/signoff/types";
import { EmptyState } from "@/components/ui/empty-state";
import { Table, TBody, THead, Td, Th, Tr } from "@/components/ui/table";
import { listSignoffs, type SignoffView } from "@/db/queries/signoffs";
import { can } from "@/lib/base/permission-table";
import { loadProject } from "../load-project";
import { formatDate } from "@/lib/base/dates";

export const metadata: Metadata = { title: "Sign-offs" };

const ORDER: SignoffView["displayState"][] = ["requested", "approved", "changes_requested", "stale"];

const DESCRIPTIONS: Record<SignoffView["displayState"], string> = {
  requested: "Waiting for the reviewer's decision.",
  approved: "Approved, and the scenario has not changed since.",
  changes_requested: "The reviewer asked for changes.",
  stale: "The scenario changed after the sign-off was requested; these cover older content.",
};

function SignoffTable({ items, projectId }: { items: SignoffView[]; projectId: string }) {
  return (
    <Table dense>
      <THead>
        <Tr>
          <Th>Scenario</Th>
          <Th>Revision</Th>
          <Th>Reviewer</Th>
          <Th>State</Th>
          <Th>Requested</Th>
          <Th>Note</Th>
          <Th>Comment</Th>
          <Th>Review</Th>
        </Tr>
      </THead>
      <TBody>
        {items.map((s) => (
          <Tr key={s.id} data-testid="signoff-row">
            <Td>
              <Link className="underline" href={`/projects/${projectId}/scenarios/${s.scenarioId}`}>
                {s.scenarioName}
              </Link>
            </Td>
            <Td className="figures">
              {s.revisionNumber}
              {s.stale ? <span className="text-muted"> (now {s.latestRevisionNumber})</span> : null}
            </Td>
            <Td>{s.reviewer.name}</Td>
            <Td>
              <SignoffStateBadge signoff={s} />
            </Td>
            <Td className="figures whitespace-nowrap text-xs">
              {formatDate(s.createdAt)} by {s.requestedBy?.name ?? "a former member"}
            </Td>
            <Td className="text-sm">
              {s.requestNote || <span className="text-muted">no note</span>}
              {s.verdictSnapshot && s.verdictSnapshot.length > 0 ? (
                <p className="mt-1 text-xs text-muted">
                  Asked on: {s.verdictSnapshot.map((v) => `${v.check.replace(/_/g, " ")} ${v.verdict}`).join(", ")}
                </p>
              ) : null}
            </Td>
            <Td className="text-sm">{s.comment}</Td>
            <Td className="text-sm whitespace-nowrap">
              {/* the scenario page's sign-off card decides; the bundle is the evidence of exactly that revision */}
              <Link className="text-link" href={`/projects/${projectId}/scenarios/${s.scenarioId}#signoff-heading`}>
                Review<span className="sr-only"> {s.scenarioName} r{s.revisionNumber}</span>
              </Link>
              {" · "}
              <a className="text-link" href={`/api/projects/${projectId}/scenarios/${s.scenarioId}/bundle?revisionId=${encodeURIComponent(s.revisionId)}`} download>
                Evidence<span className="sr-only"> bundle of {s.scenarioName} r{s.revisionNumber}</span>
              </a>
            </Td>
          </Tr>
        ))}
      </TBody>
    </Table>
  );
}

export default async function SignoffsPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { user, project } = await loadProject(projectId);
  const signoffs = await listSignoffs({ userId: user.id, projectId });
  const groups = ORDER.map((state) => ({ state, items: signoffs.filter((s) => s.displayState === state) }));
  return (
    <div className="flex flex-col gap-6">
      <section aria-labelledby="signoffs-heading" className="flex flex-col gap-4">
        <h2 id="signoffs-heading" className="text-lg font-semibold">
          Sign-offs
        </h2>
        {signoffs.length === 0 ? (
          <EmptyState title="No sign-offs yet" description="Request a sign-off from a scenario's page; reviewers decide there too." />
        ) : (
          groups.map(({ state, items }) => (
            <section key={state} aria-labelledby={`signoffs-${state}`} className="flex flex-col gap-2" data-testid={`signoffs-${state}`}>
              <h3 id={`signoffs-${state}`} className="text-base font-semibold">
                {STATE_LABELS[state]} <span className="figures text-muted">({items.length})</span>
              </h3>
              <p className="text-sm text-muted">{DESCRIPTIONS[state]}</p>
              {items.length > 0 ? <SignoffTable items={items} projectId={project.id} /> : null}
            </section>
          ))
        )}
      </section>
      {can(project.role, "bundle.import") ? (
        <section aria-labelledby="import-heading" className="flex max-w-xl flex-col gap-2">
          <h2 id="import-heading" className="text-lg font-semibold">
            Import a bundle
          </h2>
          <p className="text-sm text-muted">A bundle becomes a new scenario in this project, with the parts it uses.</p>
          <ImportBundleForm projectId={project.id} />
        </section>
      ) : null}
    </div>
  );
}
