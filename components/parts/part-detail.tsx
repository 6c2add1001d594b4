"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useMemo, useState } from "react";
import useSWR from "swr";
import { Alert, Badge, Button, ConfirmDialog, Spinner, Table, TBody, Td, Th, THead, Tr, VerdictBadge } from "@/components/ui";
import { TracePlot } from "@/components/results/trace-plot";
import { fetchJson, requestJson, scenarioUrls } from "@/lib/browser/api-client";
import { formatDate } from "@/lib/base/dates";
import { formatHz } from "@/engine/format";
import { parseTouchstone, type TouchstoneData } from "@/engine/touchstone";
import { describeVersionChanges, magnitudeDb, maxMagnitudeChangeDb } from "@/lib/domain/parts/compare";
import type { PartUseView, PartVersionView, PartView } from "@/lib/domain/parts/types";

type VersionsResponse = { fileName: string; versions: PartVersionView[]; uses: PartUseView[] };

function formatReference(ohms: [number, number][]): string {
  const texts = ohms.map(([re, im]) => (im === 0 ? `${re}` : `${re}${im < 0 ? "−" : "+"}j${Math.abs(im)}`));
  return new Set(texts).size === 1 ? `${texts[0]} Ω` : `${texts.join(", ")} Ω`;
}

function formatBytes(bytes: number): string {
  return bytes < 1024 ? `${bytes} B` : bytes < 1024 * 1024 ? `${(bytes / 1024).toFixed(1)} KiB` : `${(bytes / (1024 * 1024)).toFixed(2)} MiB`;
}

/** Pairs shown first: every one up to 2 ports, else the first port's reflection and the through paths from it. */
function defaultPairs(n: number): string[] {
  if (n <= 2) return Array.from({ length: n * n }, (_, k) => `${Math.floor(k / n)},${k % n}`);
  return ["0,0", ...Array.from({ length: n - 1 }, (_, k) => `${k + 1},0`)];
}

/** Fetches and reads one version's Touchstone text in the browser (the server only stores it). */
function usePartData(projectId: string, version: PartVersionView | undefined): { data: TouchstoneData | null; error: string | null; loading: boolean } {
  const { data: body, error } = useSWR<{ part: PartView }>(version ? scenarioUrls.part(projectId, version.id) : null, fetchJson, { revalidateOnFocus: false });
  return useMemo(() => {
    if (error) return { data: null, error: error instanceof Error ? error.message : String(error), loading: false };
    if (!body?.part.text || !version) return { data: null, error: null, loading: Boolean(version) };
    try {
      return { data: parseTouchstone(body.part.text, { name: version.fileName }), error: null, loading: false };
    } catch (e) {
      return { data: null, error: e instanceof Error ? e.message : String(e), loading: false };
    }
  }, [body, error, version]);
}

/**
 * A part's page: traces of the chosen version (|S_ij| in dB over frequency), its passivity and reciprocity
 * figures, where the part is used and which version each block pins, every version with what changed
 * against the one before, and deleting a version no scenario pins.
 */
export function PartDetail({
  projectId,
  partId,
  fileName,
  initialVersions,
  initialUses,
  canEdit,
}: {
  projectId: string;
  partId: string;
  fileName: string;
  initialVersions: PartVersionView[];
  initialUses: PartUseView[];
  canEdit: boolean;
}) {
  const router = useRouter();
  const { data, mutate } = useSWR<VersionsResponse>(scenarioUrls.partVersions(projectId, partId), fetchJson, {
    fallbackData: { fileName, versions: initialVersions, uses: initialUses },
  });
  const versions = data?.versions ?? initialVersions;
  const uses = data?.uses ?? initialUses;
  const latest = versions[versions.length - 1];
  const [chosen, setChosen] = useState<number>(() => versions.find((v) => v.id === partId)?.partVersion ?? latest?.partVersion ?? 1);
  const current = versions.find((v) => v.partVersion === chosen) ?? latest;
  const previous = current ? [...versions].reverse().find((v) => v.partVersion < current.partVersion) : undefined;
  const [deleting, setDeleting] = useState<PartVersionView | null>(null);
  const [deleteError, setDeleteError] = useState<string | null>(null);

  const usedBy = (version: number) => uses.filter((u) => u.partVersion === version);
  if (!latest || !current) return <Alert tone="warn" title="This part has no versions left">It was deleted.</Alert>;

  return (
    <section aria-labelledby="part-heading" className="flex flex-col gap-6">
      <div className="flex flex-wrap items-baseline gap-3">
        <h2 id="part-heading" className="text-lg font-semibold text-ink">
          {latest.name}
        </h2>
        <span className="font-mono text-sm text-muted">{fileName}</span>
        <Badge>
          {versions.length} {versions.length === 1 ? "version" : "versions"}
        </Badge>
        <Link href={`/projects/${projectId}/parts`} className="text-sm text-muted underline underline-offset-4 hover:text-ink">
          All parts
        </Link>
      </div>

      <Traces projectId={projectId} versions={versions} current={current} previous={previous} onChoose={setChosen} />

      <section aria-labelledby="uses-heading" className="flex flex-col gap-2">
        <h3 id="uses-heading" className="font-semibold text-ink">
          Where it is used
        </h3>
        {uses.length === 0 ? (
          <p className="text-sm text-muted">No scenario&apos;s latest revision places this part.</p>
        ) : (
          <Table aria-label="Where it is used">
            <THead>
              <Tr>
                <Th>Scenario</Th>
                <Th>Block</Th>
                <Th numeric>Pinned version</Th>
              </Tr>
            </THead>
            <TBody>
              {uses.map((u) => (
                <Tr key={`${u.scenarioId}:${u.blockId}`}>
                  <Td>
                    <Link href={`/projects/${projectId}/scenarios/${u.scenarioId}`} className="font-medium text-ink underline decoration-rule-strong underline-offset-4 hover:decoration-ink">
                      {u.scenarioName}
                    </Link>
                  </Td>
                  <Td className="font-mono text-xs">{u.blockId}</Td>
                  <Td numeric>
                    {u.partVersion}
                    {u.partVersion < latest.partVersion ? (
                      <Badge tone="warn" className="ml-2" title={`Version ${latest.partVersion} is available`}>
                        behind
                      </Badge>
                    ) : null}
                  </Td>
                </Tr>
              ))}
            </TBody>
          </Table>
        )}
      </section>

      <section aria-labelledby="versions-heading" className="flex flex-col gap-2">
        <h3 id="versions-heading" className="font-semibold text-ink">
          Versions
        </h3>
        <Table aria-label="Versions">
          <THead>
            <Tr>
              <Th numeric>Version</Th>
              <Th>Uploaded</Th>
              <Th numeric>Size</Th>
              <Th numeric>Points</Th>
              <Th>Range</Th>
              <Th>Figures</Th>
              <Th>Changed from the version before</Th>
              <Th>
                <span className="sr-only">Actions</span>
              </Th>
            </Tr>
          </THead>
          <TBody>
            {versions.map((v, k) => {
              const users = usedBy(v.partVersion);
              const changes = k > 0 ? describeVersionChanges(versions[k - 1], v) : [];
              return (
                <Tr key={v.id} data-version={v.partVersion}>
                  <Td numeric>
                    <button type="button" className="underline underline-offset-4" onClick={() => setChosen(v.partVersion)} aria-pressed={v.partVersion === current.partVersion} aria-label={`Show version ${v.partVersion}`}>
                      {v.partVersion}
                    </button>
                  </Td>
                  <Td className="text-xs">
                    {formatDate(v.createdAt)}
                    {v.uploadedByName ? ` · ${v.uploadedByName}` : ""}
                  </Td>
                  <Td numeric className="text-xs">
                    {formatBytes(v.sizeBytes)}
                  </Td>
                  <Td numeric>{v.points}</Td>
                  <Td className="figures text-xs">
                    {formatHz(v.startHz)} – {formatHz(v.stopHz)}
                  </Td>
                  <Td className="figures text-xs">
                    σmax {v.maxSingular.toFixed(4)} · max|Sij−Sji| {v.reciprocityError.toExponential(1)}
                  </Td>
                  <Td className="text-xs">{k === 0 ? "first version" : changes.length === 0 ? "same range, points, ports, reference and figures" : changes.join("; ")}</Td>
                  <Td>
                    {canEdit ? (
                      users.length > 0 ? (
                        <span className="text-xs text-muted">in use by {[...new Set(users.map((u) => u.scenarioName))].join(", ")}</span>
                      ) : (
                        <Button size="sm" variant="ghost" onClick={() => setDeleting(v)} aria-label={`Delete version ${v.partVersion}`}>
                          Delete
                        </Button>
                      )
                    ) : null}
                  </Td>
                </Tr>
              );
            })}
          </TBody>
        </Table>
      </section>

      <ConfirmDialog
        open={deleting !== null}
        onClose={() => {
          setDeleting(null);
          setDeleteError(null);
        }}
        title={`Delete version ${deleting?.partVersion ?? ""} of ${fileName}?`}
        description={versions.length === 1 ? "It is the only version: the part leaves the library." : "The other versions stay."}
        confirmLabel="Delete version"
        error={deleteError}
        onConfirm={async () => {
          if (!deleting) return;
          try {
            await requestJson(scenarioUrls.part(projectId, deleting.id), { method: "DELETE" });
            const left = versions.filter((v) => v.id !== deleting.id);
            setDeleting(null);
            if (left.length === 0) router.push(`/projects/${projectId}/parts`);
            else if (deleting.id === partId) router.replace(`/projects/${projectId}/parts/${left[left.length - 1].id}`);
            else await mutate();
          } catch (e) {
            setDeleteError(e instanceof Error ? e.message : String(e));
          }
        }}
      />
    </section>
  );
}

function Traces({
  projectId,
  versions,
  current,
  previous,
  onChoose,
}: {
  projectId: string;
  versions: PartVersionView[];
  current: PartVersionView;
  previous: PartVersionView | undefined;
  onChoose: (version: number) => void;
}) {
  const n = current.ports;
  // every version of a part has the same port count (a new version must keep it), so the choice stays valid
  const [pairs, setPairs] = useState<string[]>(() => defaultPairs(n));
  const { data, error, loading } = usePartData(projectId, current);
  const before = usePartData(projectId, previous);
  const change = useMemo(() => (data && before.data ? maxMagnitudeChangeDb(before.data, data) : null), [data, before.data]);
  const series = useMemo(
    () =>
      data
        ? pairs.map((key) => {
            const [i, j] = key.split(",").map(Number);
            return { label: `|S${i + 1}${j + 1}|`, values: magnitudeDb(data, i, j) };
          })
        : [],
    [data, pairs],
  );
  const frequencies = useMemo(() => (data ? Float64Array.from(data.frequencies) : new Float64Array(0)), [data]);

  return (
    <section aria-labelledby="traces-heading" className="flex flex-col gap-3 rounded-card border border-rule bg-surface p-4">
      <div className="flex flex-wrap items-center gap-3">
        <h3 id="traces-heading" className="font-semibold text-ink">
          Version {current.partVersion}
        </h3>
        {versions.length > 1 ? (
          <label className="flex items-center gap-2 text-sm text-muted">
            Version
            <select className="rounded border border-rule bg-surface px-2 py-1 text-ink" value={current.partVersion} onChange={(e) => onChoose(Number(e.target.value))} aria-label="Version shown">
              {versions.map((v) => (
                <option key={v.id} value={v.partVersion}>
                  {v.partVersion}
                </option>
              ))}
            </select>
          </label>
        ) : null}
      </div>
      <dl className="grid grid-cols-[max-content_1fr] gap-x-4 gap-y-1 text-sm" aria-label="Figures">
        <dt className="text-muted">Ports, points</dt>
        <dd className="figures">
          {current.ports} ports, {current.points} points, Touchstone {current.version}
        </dd>
        <dt className="text-muted">Range</dt>
        <dd className="figures">
          {formatHz(current.startHz)} – {formatHz(current.stopHz)}
        </dd>
        <dt className="text-muted">Reference</dt>
        <dd className="figures">{formatReference(current.referenceOhms)}</dd>
        <dt className="text-muted">Passivity</dt>
        <dd className="flex flex-wrap items-center gap-2">
          {current.active ? <Badge data-active="true">Active part</Badge> : <VerdictBadge verdict={current.passivity} label={current.passivity === "pass" ? "Passive" : "Active"} />}
          <span className="figures text-xs">
            largest singular value of S {current.maxSingular.toFixed(4)} at {formatHz(current.maxSingularHz)}
          </span>
          {current.activeReason ? <span className="text-xs text-muted">{current.activeReason}; checked for stability</span> : null}
        </dd>
        <dt className="text-muted">Reciprocity</dt>
        <dd className="flex flex-wrap items-center gap-2">
          <VerdictBadge verdict={current.reciprocity} label={current.reciprocity === "pass" ? "Reciprocal" : "Not reciprocal"} />
          <span className="figures text-xs">
            max|Sij−Sji| {current.reciprocityError.toExponential(2)} at {formatHz(current.reciprocityHz)}
          </span>
        </dd>
        {previous ? (
          <>
            <dt className="text-muted">Against version {previous.partVersion}</dt>
            <dd className="figures text-xs" data-testid="max-change">
              {change
                ? `largest change of |S${change.i + 1}${change.j + 1}| ${change.db.toFixed(2)} dB at ${formatHz(change.hz)} (over the common range)`
                : before.loading || loading
                  ? "comparing…"
                  : "no common frequency range"}
            </dd>
          </>
        ) : null}
      </dl>
      <fieldset className="flex flex-wrap gap-x-3 gap-y-1 text-xs">
        <legend className="mb-1 text-sm text-muted">Traces (|S_ij| in dB)</legend>
        {Array.from({ length: n * n }, (_, k) => {
          const key = `${Math.floor(k / n)},${k % n}`;
          const label = `S${Math.floor(k / n) + 1}${(k % n) + 1}`;
          return (
            <label key={key} className="flex items-center gap-1 font-mono">
              <input type="checkbox" checked={pairs.includes(key)} onChange={(e) => setPairs((p) => (e.target.checked ? [...p, key] : p.filter((x) => x !== key)))} />
              {label}
            </label>
          );
        })}
      </fieldset>
      {error ? <Alert tone="error" title="The part's data could not be read">{error}</Alert> : null}
      {loading && !data ? <Spinner label="Loading the part's data…" /> : null}
      {data && series.length > 0 ? <TracePlot frequencies={frequencies} series={series} unit="dB" markers={[]} onHover={() => {}} onPick={() => {}} height={260} /> : null}
      {data && series.length === 0 ? <p className="text-sm text-muted">Choose at least one trace.</p> : null}
    </section>
  );
}
