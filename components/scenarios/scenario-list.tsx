"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState, type FormEvent } from "react";
import useSWR from "swr";
import { Alert, Button, ConfirmDialog, EmptyState, Field, Input, Select, Spinner, Table, TBody, Td, Th, THead, Tr, Badge } from "@/components/ui";
import { SCENARIO_TEMPLATES, type ScenarioTemplate } from "@/lib/base/validation/scenarios";
import { ApiError, fetchJson, requestJson, scenarioUrls } from "@/lib/browser/api-client";
import { TEMPLATE_LABELS } from "@/lib/domain/scenarios/templates";
import type { ScenarioListItem } from "@/lib/domain/scenarios/types";
import { formatDate } from "@/lib/base/dates";

type ListResponse = { scenarios: ScenarioListItem[] };

/** The project's scenarios: create (blank or from a template), open, rename, duplicate, delete. */
export function ScenarioList({ projectId, initial, canEdit }: { projectId: string; initial: ScenarioListItem[]; canEdit: boolean }) {
  const router = useRouter();
  const { data, error, isLoading, mutate } = useSWR<ListResponse>(scenarioUrls.list(projectId), fetchJson, { fallbackData: { scenarios: initial } });
  const [renaming, setRenaming] = useState<ScenarioListItem | null>(null);
  const [deleting, setDeleting] = useState<ScenarioListItem | null>(null);
  const [actionError, setActionError] = useState<string | null>(null);
  const [busy, setBusy] = useState<string | null>(null);
  const list = data?.scenarios ?? [];

  const duplicate = async (item: ScenarioListItem) => {
    setBusy(item.id);
    setActionError(null);
    try {
      await requestJson(scenarioUrls.duplicate(projectId, item.id), { method: "POST" });
      await mutate();
    } catch (e) {
      setActionError(e instanceof Error ? e.message : String(e));
    } finally {
      setBusy(null);
    }
  };

  return (
    <div className="flex flex-col gap-6">
      {canEdit ? <CreateScenarioForm projectId={projectId} onCreated={(id) => router.push(`/projects/${projectId}/scenarios/${id}`)} /> : null}
      {error ? <Alert tone="error" title="The scenarios could not be loaded">{error instanceof Error ? error.message : String(error)}</Alert> : null}
      {actionError ? (
        <Alert tone="error" title="That did not work" actions={<Button size="sm" variant="ghost" onClick={() => setActionError(null)}>Dismiss</Button>}>
          {actionError}
        </Alert>
      ) : null}
      {isLoading && list.length === 0 ? <Spinner label="Loading scenarios…" /> : null}
      {!isLoading && list.length === 0 ? (
        <EmptyState
          title="No scenarios yet"
          description={canEdit ? "Create one above: start from a blank chart or a small template." : "An engineer of this project has not created any scenario yet."}
        />
      ) : null}
      {list.length > 0 ? (
        <Table aria-label="Scenarios">
          <THead>
            <Tr>
              <Th>Scenario</Th>
              <Th numeric>Revision</Th>
              <Th numeric>Blocks</Th>
              <Th>System ports</Th>
              <Th>Last saved</Th>
              <Th>
                <span className="sr-only">Actions</span>
              </Th>
            </Tr>
          </THead>
          <TBody>
            {list.map((item) => (
              <Tr key={item.id}>
                <Td>
                  <Link href={`/projects/${projectId}/scenarios/${item.id}`} className="font-medium text-ink underline decoration-rule-strong underline-offset-4 hover:decoration-ink">
                    {item.name}
                  </Link>
                  {item.warningCount > 0 ? (
                    <Badge tone="warn" className="ml-2" title="The latest revision cannot be solved yet">
                      draft
                    </Badge>
                  ) : null}
                  {item.blocksBehind ? (
                    <Badge tone="neutral" className="ml-2" title="Blocks that use an older version of their part than the library's latest">
                      {item.blocksBehind} {item.blocksBehind === 1 ? "block" : "blocks"} behind
                    </Badge>
                  ) : null}
                </Td>
                <Td numeric>{item.revisionNumber}</Td>
                <Td numeric>{item.blockCount}</Td>
                <Td className="font-mono text-xs">{item.portNames.join(", ") || "—"}</Td>
                <Td className="figures text-xs text-muted">
                  {formatDate(item.updatedAt)}{item.updatedByName ? ` · ${item.updatedByName}` : ""}
                </Td>
                <Td>
                  {canEdit ? (
                    <div className="flex justify-end gap-1">
                      <Button size="sm" variant="ghost" onClick={() => setRenaming(item)} aria-label={`Rename ${item.name}`}>
                        Rename
                      </Button>
                      <Button size="sm" variant="ghost" loading={busy === item.id} onClick={() => duplicate(item)} aria-label={`Duplicate ${item.name}`}>
                        Duplicate
                      </Button>
                      <Button size="sm" variant="ghost" onClick={() => setDeleting(item)} aria-label={`Delete ${item.name}`}>
                        Delete
                      </Button>
                    </div>
                  ) : null}
                </Td>
              </Tr>
            ))}
          </TBody>
        </Table>
      ) : null}
      {renaming ? (
        <RenameDialog
          projectId={projectId}
          item={renaming}
          onClose={() => setRenaming(null)}
          onDone={async () => {
            setRenaming(null);
            await mutate();
          }}
        />
      ) : null}
      <ConfirmDialog
        open={deleting !== null}
        onClose={() => setDeleting(null)}
        title={`Delete ${deleting?.name ?? "scenario"}?`}
        description="The scenario and every one of its revisions are removed. This cannot be undone."
        confirmLabel="Delete scenario"
        onConfirm={async () => {
          if (!deleting) return;
          try {
            await requestJson(scenarioUrls.one(projectId, deleting.id), { method: "DELETE" });
            setDeleting(null);
            await mutate();
          } catch (e) {
            setDeleting(null);
            setActionError(e instanceof Error ? e.message : String(e));
          }
        }}
      />
    </div>
  );
}

function CreateScenarioForm({ projectId, onCreated }: { projectId: string; onCreated: (id: string) => void }) {
  const [name, setName] = useState("");
  const [template, setTemplate] = useState<ScenarioTemplate>("blank");
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [pending, setPending] = useState(false);

  const submit = async (event: FormEvent) => {
    event.preventDefault();
    if (name.trim() === "") {
      setErrors({ name: "Enter a scenario name." });
      return;
    }
    setPending(true);
    setErrors({});
    try {
      const created = await requestJson<{ scenario: { id: string } }>(scenarioUrls.list(projectId), { method: "POST", json: { name, template } });
      onCreated(created.scenario.id);
    } catch (e) {
      if (e instanceof ApiError && e.fields) setErrors(e.fields);
      else setErrors({ _: e instanceof Error ? e.message : String(e) });
      setPending(false);
    }
  };

  return (
    <form onSubmit={submit} aria-label="New scenario" className="flex flex-wrap items-end gap-3 rounded-card border border-rule bg-surface p-4" noValidate>
      <Field label="New scenario name" error={errors.name} className="min-w-64 flex-1">
        <Input value={name} onChange={(e) => setName(e.target.value)} maxLength={200} placeholder="e.g. Dual antenna, cheaper switch" />
      </Field>
      <Field label="Start from" error={errors.template} className="w-72">
        <Select value={template} onChange={(e) => setTemplate(e.target.value as ScenarioTemplate)} options={SCENARIO_TEMPLATES.map((t) => ({ value: t, label: TEMPLATE_LABELS[t] }))} />
      </Field>
      <Button type="submit" loading={pending} loadingText="Creating…">
        Create scenario
      </Button>
      {errors._ ? (
        <p role="alert" className="w-full text-sm text-fail-strong">
          {errors._}
        </p>
      ) : null}
    </form>
  );
}

function RenameDialog({ projectId, item, onClose, onDone }: { projectId: string; item: ScenarioListItem; onClose: () => void; onDone: () => Promise<void> }) {
  const [name, setName] = useState(item.name);
  const [error, setError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);
  return (
    <ConfirmDialog
      open
      onClose={onClose}
      title={`Rename ${item.name}`}
      confirmLabel="Rename"
      tone="primary"
      pending={pending}
      error={error}
      onConfirm={async () => {
        setPending(true);
        try {
          await requestJson(scenarioUrls.one(projectId, item.id), { method: "PATCH", json: { name } });
          await onDone();
        } catch (e) {
          setError(e instanceof ApiError && e.fields?.name ? e.fields.name : e instanceof Error ? e.message : String(e));
        } finally {
          setPending(false);
        }
      }}
    >
      <Field label="Scenario name">
        <Input value={name} onChange={(e) => setName(e.target.value)} maxLength={200} />
      </Field>
    </ConfirmDialog>
  );
}
