"use client";

import Link from "next/link";
import { useRef, useState, type FormEvent } from "react";
import useSWR from "swr";
import { Alert, Badge, Button, ConfirmDialog, EmptyState, Field, Input, Spinner, Table, TBody, Td, Th, THead, Tr, VerdictBadge } from "@/components/ui";
import { fetchJson, requestJson, scenarioUrls } from "@/lib/browser/api-client";
import type { PartView } from "@/lib/domain/parts/types";
import { formatHz } from "@/engine/format";
import { PART_MAX_BYTES } from "@/lib/base/validation/parts";
import { PreviewTrace } from "./preview-trace";

function formatReference(ohms: [number, number][]): string {
  const texts = ohms.map(([re, im]) => (im === 0 ? `${re}` : `${re}${im < 0 ? "−" : "+"}j${Math.abs(im)}`));
  return new Set(texts).size === 1 ? `${texts[0]} Ω` : `${texts.join(", ")} Ω`;
}

/** The project's Touchstone parts: upload, figures, badges, preview traces, delete. */
export function PartsLibrary({ projectId, initial, canEdit }: { projectId: string; initial: PartView[]; canEdit: boolean }) {
  const { data, error, isLoading, mutate } = useSWR<{ parts: PartView[] }>(scenarioUrls.parts(projectId), fetchJson, { fallbackData: { parts: initial } });
  const [deleting, setDeleting] = useState<PartView | null>(null);
  const [deleteError, setDeleteError] = useState<string | null>(null);
  const list = data?.parts ?? [];

  return (
    <div className="flex flex-col gap-6">
      {canEdit ? <UploadForm projectId={projectId} onUploaded={() => void mutate()} /> : null}
      {error ? <Alert tone="error" title="The parts could not be loaded">{error instanceof Error ? error.message : String(error)}</Alert> : null}
      {isLoading && list.length === 0 ? <Spinner label="Loading parts…" /> : null}
      {!isLoading && list.length === 0 ? (
        <EmptyState title="No parts yet" description={canEdit ? "Upload a Touchstone file (.s1p … .sNp or .ts) to place measured or vendor data on a chart." : "Engineers of this project have not uploaded any part."} />
      ) : null}
      {list.length > 0 ? (
        <Table aria-label="Parts">
          <THead>
            <Tr>
              <Th>Part</Th>
              <Th numeric>Ports</Th>
              <Th>Frequency range</Th>
              <Th numeric>Points</Th>
              <Th>Reference</Th>
              <Th>Passivity</Th>
              <Th>Reciprocity</Th>
              <Th>Preview</Th>
              <Th>
                <span className="sr-only">Actions</span>
              </Th>
            </Tr>
          </THead>
          <TBody>
            {list.map((p) => (
              <Tr key={p.fileName} id={`part-${p.id}`} className="target:bg-sea/15">
                <Td>
                  <Link href={`/projects/${projectId}/parts/${p.id}`} className="font-medium text-ink underline decoration-rule-strong underline-offset-4 hover:decoration-ink">
                    {p.name}
                  </Link>
                  <div className="font-mono text-xs text-muted">
                    {p.fileName} · Touchstone {p.version}
                  </div>
                  <div className="text-xs text-muted" data-testid="part-version-count">
                    version {p.partVersion}
                    {(p.versions?.length ?? 1) > 1 ? ` · ${p.versions?.length} versions` : ""}
                  </div>
                </Td>
                <Td numeric>{p.ports}</Td>
                <Td className="figures text-xs">
                  {formatHz(p.startHz)} – {formatHz(p.stopHz)}
                </Td>
                <Td numeric>{p.points}</Td>
                <Td className="figures text-xs">{formatReference(p.referenceOhms)}</Td>
                <Td>
                  <div className="flex flex-col items-start gap-0.5">
                    {p.active ? (
                      <Badge tone="neutral" title={p.activeReason ?? undefined} data-active="true">
                        Active part
                      </Badge>
                    ) : (
                      <VerdictBadge verdict={p.passivity} label={p.passivity === "pass" ? "Passive" : "Active"} />
                    )}
                    {p.active && p.activeReason ? <span className="text-[11px] text-muted">{p.activeReason}; checked for stability</span> : null}
                    <span className="figures text-[11px] text-muted" title={`at ${formatHz(p.maxSingularHz)}`}>
                      σmax {p.maxSingular.toFixed(4)}
                    </span>
                  </div>
                </Td>
                <Td>
                  <div className="flex flex-col items-start gap-0.5">
                    <VerdictBadge verdict={p.reciprocity} label={p.reciprocity === "pass" ? "Reciprocal" : "Not reciprocal"} />
                    <span className="figures text-[11px] text-muted" title={`at ${formatHz(p.reciprocityHz)}`}>
                      max|Sij−Sji| {p.reciprocityError.toExponential(1)}
                    </span>
                  </div>
                </Td>
                <Td>
                  <PreviewTrace {...p.preview} />
                  <div className="text-[11px] text-muted">{p.preview.label} dB</div>
                </Td>
                <Td>
                  {canEdit ? (
                    <div className="flex flex-col items-end gap-1">
                      <NewVersionButton projectId={projectId} part={p} onUploaded={() => void mutate()} />
                      <Button size="sm" variant="ghost" onClick={() => setDeleting(p)} aria-label={`Delete part ${p.fileName}`}>
                        {(p.versions?.length ?? 1) > 1 ? `Delete version ${p.partVersion}` : "Delete"}
                      </Button>
                    </div>
                  ) : null}
                </Td>
              </Tr>
            ))}
          </TBody>
        </Table>
      ) : null}
      <ConfirmDialog
        open={deleting !== null}
        onClose={() => {
          setDeleting(null);
          setDeleteError(null);
        }}
        title={`Delete ${deleting?.fileName ?? "part"}${deleting && (deleting.versions?.length ?? 1) > 1 ? ` version ${deleting.partVersion}` : ""}?`}
        description="Scenarios that place this version must stop using it (or move to another version) first. Other versions stay."
        confirmLabel="Delete part"
        error={deleteError}
        onConfirm={async () => {
          if (!deleting) return;
          try {
            await requestJson(scenarioUrls.part(projectId, deleting.id), { method: "DELETE" });
            setDeleting(null);
            await mutate();
          } catch (e) {
            setDeleteError(e instanceof Error ? e.message : String(e));
          }
        }}
      />
    </div>
  );
}

/**
 * "Upload new version" of one part: the chosen file becomes the next version of this part's file name
 * (asked for explicitly with `new_version_of`; a plain upload of a taken name is refused).
 */
function NewVersionButton({ projectId, part, onUploaded }: { projectId: string; part: PartView; onUploaded: () => void }) {
  const input = useRef<HTMLInputElement>(null);
  const [pending, setPending] = useState(false);
  const [message, setMessage] = useState<{ tone: "error" | "done"; text: string } | null>(null);
  const upload = async (file: File) => {
    if (file.size > PART_MAX_BYTES) {
      setMessage({ tone: "error", text: `The file is ${(file.size / (1024 * 1024)).toFixed(1)} MB; the limit is ${PART_MAX_BYTES / (1024 * 1024)} MB.` });
      return;
    }
    const form = new FormData();
    form.set("file", file, file.name);
    form.set("new_version_of", part.fileName);
    setPending(true);
    setMessage(null);
    try {
      const { part: created } = await requestJson<{ part: PartView }>(scenarioUrls.parts(projectId), { method: "POST", body: form });
      setMessage({ tone: "done", text: `Version ${created.partVersion} of ${created.fileName}: ${created.points} points.` });
      onUploaded();
    } catch (e) {
      setMessage({ tone: "error", text: e instanceof Error ? e.message : String(e) });
    } finally {
      setPending(false);
      if (input.current) input.current.value = "";
    }
  };
  return (
    <>
      <input
        ref={input}
        type="file"
        className="sr-only"
        tabIndex={-1}
        aria-label={`New version of ${part.fileName}`}
        accept=".ts,.s1p,.s2p,.s3p,.s4p,.s5p,.s6p,.s7p,.s8p,.s9p,.s10p,.s12p,.s16p"
        onChange={(e) => {
          const file = e.target.files?.[0];
          if (file) void upload(file);
        }}
      />
      <Button size="sm" variant="secondary" loading={pending} loadingText="Uploading…" onClick={() => input.current?.click()} aria-label={`Upload new version of ${part.fileName}`}>
        Upload new version
      </Button>
      {message ? (
        <p role={message.tone === "error" ? "alert" : "status"} className={message.tone === "error" ? "max-w-56 text-xs text-fail-strong" : "max-w-56 text-xs text-pass-strong"}>
          {message.text}
        </p>
      ) : null}
    </>
  );
}

function UploadForm({ projectId, onUploaded }: { projectId: string; onUploaded: () => void }) {
  const fileInput = useRef<HTMLInputElement>(null);
  const [name, setName] = useState("");
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [done, setDone] = useState<string | null>(null);
  const [pending, setPending] = useState(false);

  const submit = async (event: FormEvent) => {
    event.preventDefault();
    setDone(null);
    const file = fileInput.current?.files?.[0];
    if (!file) {
      setErrors({ file: "Choose a Touchstone file." });
      return;
    }
    if (file.size > PART_MAX_BYTES) {
      setErrors({ file: `The file is ${(file.size / (1024 * 1024)).toFixed(1)} MB; the limit is ${PART_MAX_BYTES / (1024 * 1024)} MB.` });
      return;
    }
    const form = new FormData();
    form.set("file", file, file.name);
    form.set("name", name);
    setPending(true);
    setErrors({});
    try {
      const { part } = await requestJson<{ part: PartView }>(scenarioUrls.parts(projectId), { method: "POST", body: form });
      setDone(`Uploaded ${part.fileName}: ${part.ports} ports, ${part.points} points.`);
      setName("");
      if (fileInput.current) fileInput.current.value = "";
      onUploaded();
    } catch (e) {
      // the server's message names the file and the line of a parse error
      setErrors({ file: e instanceof Error ? e.message : String(e) });
    } finally {
      setPending(false);
    }
  };

  return (
    <form onSubmit={submit} aria-label="Upload a part" className="flex flex-wrap items-end gap-3 rounded-card border border-rule bg-surface p-4" noValidate>
      <Field label="Touchstone file" hint={`.s1p … .sNp (1.1) or .ts (2.0), at most ${PART_MAX_BYTES / (1024 * 1024)} MB`} error={errors.file} className="min-w-72 flex-1">
        <Input ref={fileInput} type="file" accept=".ts,.s1p,.s2p,.s3p,.s4p,.s5p,.s6p,.s7p,.s8p,.s9p,.s10p,.s12p,.s16p" />
      </Field>
      <Field label="Part name (optional)" error={errors.name} className="w-64">
        <Input value={name} onChange={(e) => setName(e.target.value)} maxLength={120} placeholder="from the file name" />
      </Field>
      <Button type="submit" loading={pending} loadingText="Uploading…">
        Upload part
      </Button>
      {done ? (
        <p role="status" className="w-full text-sm text-pass-strong">
          {done}
        </p>
      ) : null}
    </form>
  );
}
