"use client";

import { useCallback, useState } from "react";
import useSWR from "swr";
import { Download } from "lucide-react";
import { ApiError, fetchJson, requestJson } from "@/lib/browser/api-client";
import { Alert, Button, Card, CardBody, CardDescription, CardHeader, CardTitle, Field, Textarea, buttonClassName } from "@/components/ui";
import { can, type Role } from "@/lib/base/permission-table";
import { RevisionVerdictCard } from "@/components/checks/revision-verdict";
import type { RevisionVerdict } from "@/lib/domain/checks/types";
import { SignoffStateBadge } from "./signoff-state-badge";
import { signoffUrls, type SignoffItem } from "./types";
import { formatDate } from "@/lib/base/dates";
import { useDraftStatus } from "@/lib/browser/draft-status";

type Member = { userId: string; email: string; name: string; role: Role };

export type SignoffPanelProps = {
  projectId: string;
  scenarioId: string;
  /** the signed-in user */
  userId: string;
  /** the user's role in the project (the server decides; this only hides controls) */
  role: Role;
};


/**
 * The decision on an open request, shown only once the current verdict of the revision under review is
 * known (run on open when needed). Approving a failing revision takes a waiver: a reason for each failing
 * rule; "Request changes" is then the primary button.
 */
function ReviewOnEvidence({ projectId, scenarioId, signoff, canRun, onDone }: { projectId: string; scenarioId: string; signoff: SignoffItem; canRun: boolean; onDone: () => void }) {
  const [verdict, setVerdict] = useState<RevisionVerdict | null | undefined>(undefined);
  const onVerdict = useCallback((v: RevisionVerdict | null) => setVerdict(v), []);
  return (
    <div className="mt-2 flex flex-col gap-2">
      <RevisionVerdictCard projectId={projectId} scenarioId={scenarioId} revisionId={signoff.revisionId} mode="open" canRun={canRun} onVerdict={onVerdict} title={`Current verdict of revision ${signoff.revisionNumber}`} />
      {verdict?.run ? <DecisionForm key={verdict.run.id} projectId={projectId} signoff={signoff} failing={verdict.failing} onDone={onDone} /> : null}
    </div>
  );
}

function DecisionForm({ projectId, signoff, failing, onDone }: { projectId: string; signoff: SignoffItem; failing: string[]; onDone: () => void }) {
  const [comment, setComment] = useState("");
  const [reasons, setReasons] = useState<Record<string, string>>({});
  const [busy, setBusy] = useState<null | "approved" | "changes_requested">(null);
  const [error, setError] = useState<string | null>(null);
  const fails = failing.length > 0;
  const send = async (decision: "approved" | "changes_requested") => {
    if (decision === "approved" && fails && failing.some((id) => !(reasons[id] ?? "").trim())) {
      setError(`Give a reason for waiving each failing rule: ${failing.filter((id) => !(reasons[id] ?? "").trim()).join(", ")}.`);
      return;
    }
    setBusy(decision);
    setError(null);
    try {
      const waiver = decision === "approved" && fails ? failing.map((id) => ({ id, reason: reasons[id].trim() })) : undefined;
      await requestJson(signoffUrls.decide(projectId, signoff.id), { method: "POST", json: { decision, comment, ...(waiver ? { waiver } : {}) } });
      onDone();
    } catch (e) {
      setError(e instanceof ApiError ? e.message : "The decision could not be saved.");
    } finally {
      setBusy(null);
    }
  };
  return (
    <form
      className="flex flex-col gap-2"
      aria-label={`Decide sign-off of revision ${signoff.revisionNumber}`}
      onSubmit={(e) => {
        e.preventDefault();
        void send(fails ? "changes_requested" : "approved");
      }}
    >
      {fails ? (
        <fieldset className="flex flex-col gap-2 rounded-md border border-fail/50 p-2">
          <legend className="px-1 text-sm font-medium">Waiver: to approve although {failing.join(", ")} fail{failing.length === 1 ? "s" : ""}, give a reason for each</legend>
          {failing.map((id) => (
            <Field key={id} label={`Reason for waiving ${id}`}>
              <Textarea value={reasons[id] ?? ""} onChange={(e) => setReasons((r) => ({ ...r, [id]: e.target.value }))} rows={2} maxLength={2000} />
            </Field>
          ))}
        </fieldset>
      ) : null}
      <Field label="Comment" hint="Recorded with your decision and e-mailed to the requester.">
        <Textarea value={comment} onChange={(e) => setComment(e.target.value)} rows={3} maxLength={4000} />
      </Field>
      {error ? <Alert tone="error">{error}</Alert> : null}
      <div className="flex flex-wrap gap-2">
        {fails ? (
          <>
            <Button type="submit" loading={busy === "changes_requested"} disabled={busy !== null}>
              Request changes
            </Button>
            <Button type="button" variant="secondary" loading={busy === "approved"} disabled={busy !== null} onClick={() => void send("approved")}>
              Approve with waiver
            </Button>
          </>
        ) : (
          <>
            <Button type="submit" loading={busy === "approved"} disabled={busy !== null}>
              Approve
            </Button>
            <Button type="button" variant="secondary" loading={busy === "changes_requested"} disabled={busy !== null} onClick={() => void send("changes_requested")}>
              Request changes
            </Button>
          </>
        )}
      </div>
    </form>
  );
}

function RequestForm({ projectId, scenarioId, userId, onDone }: { projectId: string; scenarioId: string; userId: string; onDone: () => void }) {
  const { data } = useSWR<{ members: Member[] }>(signoffUrls.members(projectId), fetchJson);
  const candidates = (data?.members ?? []).filter((m) => (m.role === "reviewer" || m.role === "owner") && m.userId !== userId);
  const [chosen, setChosen] = useState<string[]>([]);
  const [note, setNote] = useState("");
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ tone: "error" | "success"; text: string } | null>(null);
  // sign-off judges a saved revision: a working draft beyond it is saved (or discarded) first
  const draft = useDraftStatus(scenarioId);
  const blockedByDraft = draft?.hasDraft === true;
  const submit = async () => {
    if (blockedByDraft) return;
    if (chosen.length === 0) {
      setMessage({ tone: "error", text: "Choose at least one reviewer." });
      return;
    }
    setBusy(true);
    setMessage(null);
    try {
      const result = await requestJson<{ mail: { sent: string[]; skipped: string[]; failed: string[] } }>(`/api/projects/${projectId}/signoffs`, {
        method: "POST",
        json: { scenarioId, reviewerIds: chosen, note },
      });
      const parts = [`Asked ${chosen.length} reviewer${chosen.length === 1 ? "" : "s"}.`];
      if (result.mail.skipped.length > 0) parts.push(`No e-mail to ${result.mail.skipped.join(", ")} (turned off in their settings).`);
      if (result.mail.failed.length > 0) parts.push(`The e-mail to ${result.mail.failed.join(", ")} could not be sent.`);
      setMessage({ tone: "success", text: parts.join(" ") });
      setChosen([]);
      setNote("");
      onDone();
    } catch (e) {
      setMessage({ tone: "error", text: e instanceof ApiError ? e.message : "The request could not be sent." });
    } finally {
      setBusy(false);
    }
  };
  return (
    <form
      className="flex flex-col gap-3 border-t border-rule pt-3"
      aria-label="Request sign-off"
      onSubmit={(e) => {
        e.preventDefault();
        void submit();
      }}
    >
      <h3 className="text-sm font-semibold">Request sign-off of the latest saved revision</h3>
      {candidates.length === 0 ? (
        <p className="text-sm text-muted">No reviewer or owner besides you in this project yet. Invite one from the Members tab.</p>
      ) : (
        <fieldset className="flex flex-col gap-1">
          <legend className="mb-1 text-sm font-medium">Reviewers</legend>
          {candidates.map((m) => (
            <label key={m.userId} className="inline-flex items-center gap-2 text-sm">
              <input
                type="checkbox"
                checked={chosen.includes(m.userId)}
                onChange={(e) => setChosen((c) => (e.target.checked ? [...c, m.userId] : c.filter((id) => id !== m.userId)))}
              />
              {m.name} <span className="text-muted">({m.role}, {m.email})</span>
            </label>
          ))}
        </fieldset>
      )}
      <Field label="Note to the reviewers">
        <Textarea value={note} onChange={(e) => setNote(e.target.value)} rows={2} maxLength={2000} />
      </Field>
      {blockedByDraft ? (
        <Alert
          tone="warn"
          title={`Your draft has changes not in revision ${draft.latestNumber}`}
          actions={
            draft.openSaveRevision ? (
              <Button type="button" size="sm" onClick={draft.openSaveRevision}>
                Save revision…
              </Button>
            ) : undefined
          }
        >
          A sign-off is of a saved revision. Save your draft as a revision (or discard it) before requesting one.
        </Alert>
      ) : null}
      {message ? <Alert tone={message.tone}>{message.text}</Alert> : null}
      <div>
        <Button type="submit" loading={busy} disabled={candidates.length === 0 || blockedByDraft}>
          Request sign-off
        </Button>
      </div>
    </form>
  );
}

/**
 * The sign-off panel of a scenario: download the review bundle, see every sign-off with its state (and a
 * Stale badge once the scenario changed), decide an open request addressed to you, or request one.
 */
export function SignoffPanel({ projectId, scenarioId, userId, role }: SignoffPanelProps) {
  const { data, error, mutate } = useSWR<{ signoffs: SignoffItem[] }>(signoffUrls.list(projectId, scenarioId), fetchJson, { refreshInterval: 15_000 });
  const signoffs = data?.signoffs ?? [];
  const mayDecide = role === "reviewer" || role === "owner";
  return (
    <Card aria-labelledby="signoff-heading" className="mt-4">
      <CardHeader>
        <div>
          <CardTitle id="signoff-heading">Sign-off</CardTitle>
          <CardDescription>Reviewers check the bundle (scenario, parts, composite, checks and report) and record their decision.</CardDescription>
        </div>
        {can(role, "bundle.export") ? (
          <a href={signoffUrls.bundle(projectId, scenarioId)} download className={buttonClassName({ variant: "secondary", size: "sm" })}>
            <Download aria-hidden="true" className="h-4 w-4" />
            Download bundle
          </a>
        ) : null}
      </CardHeader>
      <CardBody className="flex flex-col gap-3">
        {error ? <Alert tone="error">{error instanceof Error ? error.message : "Sign-offs could not be loaded."}</Alert> : null}
        {data && signoffs.length === 0 ? <p className="text-sm text-muted">No sign-off has been requested for this scenario yet.</p> : null}
        <ul className="flex flex-col gap-3" aria-label="Sign-offs of this scenario">
          {signoffs.map((s) => (
            <li key={s.id} className="rounded-md border border-rule p-3" data-testid="signoff-item">
              <div className="flex flex-wrap items-center gap-2 text-sm">
                <strong>{s.reviewer.name}</strong>
                <span className="text-muted">revision {s.revisionNumber}</span>
                <SignoffStateBadge signoff={s} />
              </div>
              <p className="mt-1 text-xs text-muted">
                Requested by {s.requestedBy?.name ?? "a former member"} on {formatDate(s.createdAt)}
                {s.decidedAt ? `; decided ${formatDate(s.decidedAt)}` : ""}
              </p>
              {s.requestNote ? <p className="mt-1 text-sm">Note: {s.requestNote}</p> : null}
              {s.comment ? <p className="mt-1 text-sm">Comment: {s.comment}</p> : null}
              {s.evidence ? (
                <p className="mt-1 text-xs text-muted">
                  Decided on the verdict {s.evidence.verdict.toUpperCase()} (rule set <span className="font-mono">{s.evidence.rulesHash.slice(0, 12)}</span>, engine {s.evidence.engineVersion}).
                </p>
              ) : null}
              {s.waiver ? (
                <div className="mt-1 text-sm" data-testid="signoff-waiver">
                  <strong>Approved with a waiver:</strong>
                  <ul className="list-disc pl-5">
                    {s.waiver.rules.map((w) => (
                      <li key={w.id}>
                        <span className="font-mono">{w.id}</span>: {w.reason}
                      </li>
                    ))}
                  </ul>
                </div>
              ) : null}
              {mayDecide && s.reviewer.id === userId && s.state === "requested" && !s.stale ? (
                <ReviewOnEvidence projectId={projectId} scenarioId={scenarioId} signoff={s} canRun={can(role, "check.run")} onDone={() => void mutate()} />
              ) : null}
            </li>
          ))}
        </ul>
        {can(role, "signoff.request") ? <RequestForm projectId={projectId} scenarioId={scenarioId} userId={userId} onDone={() => void mutate()} /> : null}
      </CardBody>
    </Card>
  );
}
