"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useCallback, useEffect, useMemo, useRef, useState, type ReactNode } from "react";
import useSWR from "swr";
import { History, Save } from "lucide-react";
import { Workspace } from "@/components/scenario-editor";
import { PaneBox } from "@/components/scenario-editor/workspace-panes";
import type { PartSummary } from "@/lib/browser/scenario-model";
import { Alert, Button } from "@/components/ui";
import { ScenarioChecks } from "@/components/checks/scenario-checks";
import { ScenarioRulesPanel } from "@/components/rules/scenario-rules-panel";
import type { ChartHighlight } from "@/components/checks/leak-trace-view";
import type { Role } from "@/lib/base/permission-table";
import { fetchJson, requestJson, scenarioUrls } from "@/lib/browser/api-client";
import { formatDate } from "@/lib/base/dates";
import { partFilesOf } from "@/lib/domain/scenarios/part-files";
import { parsePinnedPartPath, pinnedPartPath } from "@/engine/system/parts";
import { RevisionHistory } from "./revision-history";
import { useAutosave } from "./use-autosave";
import type { PartView } from "@/lib/domain/parts/types";
import type { RuleSpec } from "@/engine/types";
import type { RevisionView, ScenarioView } from "@/lib/domain/scenarios/types";

export type ScenarioWorkspaceProps = {
  projectId: string;
  scenario: ScenarioView;
  revision: RevisionView;
  parts: PartView[];
  readOnly: boolean;
  /** the viewer's role (from the server), for the helm and the checks */
  role?: Role;
  /** the sign-off panel (a server component of the page), shown in the checks pane */
  signoff?: ReactNode;
};

/**
 * The host of the workspace on the scenario page: holds the edited scenario, autosaves it as a new
 * revision after edits, and on a conflict (someone saved first) keeps the edits and offers to reload
 * the latest revision or to save the edits as a new scenario.
 */
export function ScenarioWorkspace({ projectId, scenario: info, revision, parts: initialParts, readOnly, role, signoff }: ScenarioWorkspaceProps) {
  const router = useRouter();
  const { draft, base, saveState, conflict, saveError, reportError, warnings, generation, edit: onChange, saveNow, loadLatest, forget, offeredDraft, restoreDraft, discardDraft } = useAutosave({
    projectId,
    scenarioId: info.id,
    revision,
    readOnly,
  });
  const [historyOpen, setHistoryOpen] = useState(false);
  const [busy, setBusy] = useState<"reload" | "fork" | null>(null);
  const [highlight, setHighlight] = useState<{ blocks: string[]; ports: string[] } | null>(null);
  const onHighlight = useCallback((h: ChartHighlight | null) => {
    setHighlight(h ? { blocks: h.blocks, ports: h.hops.flatMap((x) => [`${x.block}:${x.inPort}`, `${x.block}:${x.outPort}`]) } : null);
  }, []);

  // the list comes without texts; the page brought the texts of the parts this revision places, and a
  // part placed later has its text fetched then (a project's unused parts never travel to the browser)
  const { data: partsData, error: partsError } = useSWR<{ parts: PartView[] }>(scenarioUrls.parts(projectId), fetchJson, {
    fallbackData: { parts: initialParts },
    revalidateOnFocus: true,
  });
  // texts are keyed as the engine looks them up: `parts/<file>` (version 1) or `parts/v<N>/<file>` (pinned)
  const [texts, setTexts] = useState<Record<string, string>>(() =>
    Object.fromEntries(initialParts.flatMap((p) => [...(p.text !== undefined ? [[pinnedPartPath(`parts/${p.fileName}`, p.partVersion), p.text]] : []), ...Object.entries(p.pinnedTexts ?? {})])),
  );
  const [textError, setTextError] = useState<string | null>(null);
  // the same request as the rules panel's (SWR shares it): the results draw these rules' limit lines
  const { data: rulesData } = useSWR<{ rules: { spec: RuleSpec }[] }>(`/api/projects/${projectId}/rules`, fetchJson, { revalidateOnFocus: true });
  const projectRules = useMemo(() => (rulesData?.rules ?? []).map((r) => r.spec), [rulesData]);
  const requested = useRef(new Set<string>(Object.keys(texts)));
  const neededFiles = useMemo(() => partFilesOf(draft).join("\n"), [draft]);
  useEffect(() => {
    for (const key of neededFiles.split("\n")) {
      if (!key || requested.current.has(key)) continue;
      const { file, version } = parsePinnedPartPath(key);
      const part = (partsData?.parts ?? []).find((p) => `parts/${p.fileName}` === file);
      const id = part?.versions?.find((v) => v.partVersion === version)?.id ?? (part && part.partVersion === version ? part.id : undefined);
      if (!id) continue;
      requested.current.add(key);
      fetchJson<{ part: PartView }>(scenarioUrls.part(projectId, id))
        .then(({ part: full }) => {
          if (full.text !== undefined) setTexts((t) => ({ ...t, [key]: full.text as string }));
        })
        .catch((e: unknown) => {
          requested.current.delete(key); // let a later edit or refresh try again
          setTextError(e instanceof Error ? e.message : String(e));
        });
    }
  }, [neededFiles, partsData, projectId]);
  const parts = useMemo<PartSummary[]>(
    () =>
      (partsData?.parts ?? []).map((p) => {
        const own = Object.fromEntries(Object.entries(texts).filter(([key]) => parsePinnedPartPath(key).file === `parts/${p.fileName}`));
        return { id: p.id, name: p.name, fileName: p.fileName, ports: p.ports, version: p.partVersion, text: texts[pinnedPartPath(`parts/${p.fileName}`, p.partVersion)], texts: own, active: p.active, activeReason: p.activeReason };
      }),
    [partsData, texts],
  );

  const reload = async () => {
    setBusy("reload");
    try {
      await loadLatest();
    } catch (e) {
      reportError(e instanceof Error ? e.message : String(e));
    } finally {
      setBusy(null);
    }
  };

  const saveAsNew = async () => {
    setBusy("fork");
    try {
      const name = `${info.name} (my edits)`;
      const created = await requestJson<{ scenario: { id: string } }>(scenarioUrls.list(projectId), {
        method: "POST",
        json: { name, scenario: { ...draft, name } },
      });
      forget();
      router.push(`/projects/${projectId}/scenarios/${created.scenario.id}`);
    } catch (e) {
      reportError(e instanceof Error ? e.message : String(e));
      setBusy(null);
    }
  };

  const toolbarExtras = (
    <>
      <span className="figures text-xs text-muted" aria-label="Revision">
        r{base.number}
      </span>
      {!readOnly ? (
        <Button size="sm" variant="secondary" onClick={saveNow} disabled={saveState !== "unsaved" && saveState !== "error"} aria-label="Save now" title="Save now">
          <Save aria-hidden="true" className="h-4 w-4" /> Save
        </Button>
      ) : null}
      <Button size="sm" variant={historyOpen ? "primary" : "secondary"} onClick={() => setHistoryOpen((o) => !o)} aria-pressed={historyOpen} aria-label="Revision history">
        <History aria-hidden="true" className="h-4 w-4" /> History
      </Button>
    </>
  );

  // the checks pane: what is decided on the saved revision (history, checks, rules, sign-off)
  const side = (
    // data-workspace-keys="off": the chart's single keys (A, F, Delete) do not act from here. Its name
    // says neither "checks" nor "sign-off", which name the regions inside it.
    <PaneBox aria-label="Verdicts and review" data-workspace-keys="off" dense className="flex flex-col gap-3">
      {historyOpen ? (
        <RevisionHistory
          projectId={projectId}
          scenarioId={info.id}
          currentNumber={base.number}
          readOnly={readOnly}
          hasUnsavedEdits={saveState !== "saved"}
          onRestored={loadLatest}
        />
      ) : null}
      <ScenarioChecks
        projectId={projectId}
        scenarioId={info.id}
        scenarioName={info.name}
        role={role ?? (readOnly ? "reviewer" : "engineer")}
        revisionId={base.id}
        revisionNumber={base.number}
        scenario={draft}
        parts={parts}
        readOnly={readOnly}
        onChange={onChange}
        saveNow={saveNow}
        onHighlight={onHighlight}
      />
      <ScenarioRulesPanel projectId={projectId} scenario={draft} onChange={onChange} readOnly={readOnly} />
      {signoff}
    </PaneBox>
  );

  return (
    // data-fill-viewport: from 700 px wide this page fills the viewport and its panes scroll, not the page
    // (app/globals.css)
    <div data-fill-viewport className="flex min-h-0 min-w-0 flex-1 flex-col gap-2">
      <div className="flex flex-wrap items-baseline gap-x-3 gap-y-1">
        <h2 className="text-lg font-semibold text-ink">{info.name}</h2>
        <Link href={`/projects/${projectId}/scenarios`} className="text-sm text-muted underline underline-offset-4 hover:text-ink">
          All scenarios
        </Link>
        <a href={scenarioUrls.solve(projectId, info.id, "touchstone", base.id)} className="text-sm text-muted underline underline-offset-4 hover:text-ink" download>
          Composite of r{base.number} (Touchstone)
        </a>
      </div>
      {offeredDraft ? (
        <Alert
          tone="warn"
          title="Unsaved edits from an earlier visit"
          actions={
            <div className="flex flex-wrap gap-2">
              <Button size="sm" onClick={restoreDraft}>
                Restore my edits
              </Button>
              <Button size="sm" variant="secondary" onClick={discardDraft}>
                Discard them
              </Button>
            </div>
          }
        >
          This browser kept edits to r{offeredDraft.baseNumber} made {formatDate(offeredDraft.editedAt)} that were never saved
          {offeredDraft.baseRevisionId !== base.id ? `; the scenario has been saved since (now r${base.number}), so restoring them will ask how to resolve the conflict` : ""}.
        </Alert>
      ) : null}
      {conflict ? (
        <Alert
          tone="error"
          title="This scenario changed elsewhere"
          actions={
            <div className="flex flex-wrap gap-2">
              <Button size="sm" variant="secondary" loading={busy === "reload"} onClick={reload}>
                Reload latest (discard my edits)
              </Button>
              <Button size="sm" loading={busy === "fork"} onClick={saveAsNew}>
                Save as new scenario
              </Button>
            </div>
          }
        >
          {conflict.message} Your edits are still on the chart and are not saved.
        </Alert>
      ) : null}
      {saveError && !conflict ? (
        <Alert tone="error" title="Not saved" actions={!readOnly ? <Button size="sm" variant="secondary" onClick={saveNow}>Try again</Button> : undefined}>
          {saveError}
        </Alert>
      ) : null}
      {partsError ? <Alert tone="warn" title="The parts could not be loaded">{partsError instanceof Error ? partsError.message : String(partsError)}</Alert> : null}
      {textError && !partsError ? <Alert tone="warn" title="A placed part's data could not be loaded">{textError}</Alert> : null}
      {warnings.length > 0 && draft.blocks.length > 0 ? (
        <p className="text-xs text-warn-strong" aria-label="Revision warnings">
          Saved as a draft: {warnings.join(" ")}
        </p>
      ) : null}
      <div className="flex min-h-0 flex-1 flex-col">
        <Workspace key={generation} scenario={draft} parts={parts} readOnly={readOnly} onChange={onChange} saveState={saveState} toolbarExtras={toolbarExtras} highlight={highlight} side={side} projectRules={projectRules} />
      </div>
    </div>
  );
}
