"use client";

import { useCallback, useMemo, useState } from "react";
import type { Scenario } from "@/engine/types";
import { Badge, Button, Field, Input, Select } from "@/components/ui";
import { kindSummary, paramsOf, portLabelsOf, blockTitle } from "@/lib/browser/catalogue";
import { evaluateQuantity } from "@/lib/browser/expressions";
import { readParamInput, valueToText } from "@/lib/browser/param-input";
import {
  findPart,
  formatPortRef,
  linkedPeer,
  systemPortAt,
  getBlock,
  portCountOf,
  renameBlock,
  updateBlock,
  type PartSummary,
  type WorkspaceBlock,
} from "@/lib/browser/scenario-model";
import { formatNumber } from "@/lib/browser/format";
import { ExpressionForm, type ExpressionFieldSpec } from "./expression-form";
import { PortList } from "./port-list";
import { SpreadSection } from "./spread-section";
import { ReplaceForm } from "./replace-form";
import { PartVersionNotice } from "./part-version-notice";

export type BlockInspectorProps = {
  scenario: Scenario;
  blockId: string;
  parts: readonly PartSummary[];
  readOnly: boolean;
  /** resolved project variables (mathjs scope) */
  scope: Map<string, unknown>;
  /** changes to the form's starting values on undo/redo, so that the fields show the restored values */
  resetToken: number;
  /** applies an edit; `key` folds a burst of edits to one field into one undo step */
  commit: (next: Scenario, key?: string) => void;
  notify: (message: string) => void;
  /** called after a rename so that the selection follows the block */
  onRenamed: (from: string, to: string) => void;
};

const RATING = "rating_dbm";

/** The inspector of one block: id, parameters (expressions with units), rating and ports. */
export function BlockInspector({ scenario, blockId, parts, readOnly, scope, resetToken, commit, notify, onRenamed }: BlockInspectorProps) {
  const block = getBlock(scenario, blockId);
  if (!block) return null;
  return (
    <section aria-label={`Inspector for ${block.id}`} className="flex flex-col gap-5">
      <Header block={block} parts={parts} />
      {block.kind === "touchstone" ? <PartVersionNotice scenario={scenario} block={block} parts={parts} readOnly={readOnly} commit={commit} notify={notify} /> : null}
      <RenameForm key={`${block.id}:${resetToken}`} scenario={scenario} block={block} readOnly={readOnly} commit={commit} onRenamed={onRenamed} />
      <ReplaceForm key={`replace:${block.id}`} scenario={scenario} block={block} parts={parts} readOnly={readOnly} commit={commit} notify={notify} />
      <ParamsSection
        key={`params:${block.id}:${resetToken}`}
        scenario={scenario}
        block={block}
        parts={parts}
        readOnly={readOnly}
        scope={scope}
        commit={commit}
      />
      <SpreadSection key={`spread:${block.id}:${resetToken}`} scenario={scenario} block={block} parts={parts} readOnly={readOnly} commit={commit} />
      {block.kind === "touchstone" ? <ActivityField scenario={scenario} block={block} parts={parts} readOnly={readOnly} commit={commit} /> : null}
      <PortList scenario={scenario} block={block} parts={parts} readOnly={readOnly} commit={commit} notify={notify} />
    </section>
  );
}

function Header({ block, parts }: { block: WorkspaceBlock; parts: readonly PartSummary[] }) {
  const part = findPart(block, parts);
  return (
    <div className="flex flex-col gap-1">
      <div className="flex items-center gap-2">
        <h2 className="font-mono text-lg font-semibold text-ink">{block.id}</h2>
        <Badge>{blockTitle(block, parts)}</Badge>
      </div>
      <p className="text-sm text-muted">{kindSummary(block.kind)}</p>
      {block.kind === "touchstone" ? (
        <p className="text-xs text-muted">
          File <span className="font-mono">{block.file ?? "(inline data)"}</span>
          {part ? ` · ${part.ports} ports` : block.data ? "" : " · part not in this project's list"}
        </p>
      ) : null}
    </div>
  );
}

const ACTIVITY_OPTIONS = [
  { value: "auto", label: "From its data (active when it shows gain)" },
  { value: "active", label: "Active (amplifier): check stability" },
  { value: "passive", label: "Passive: warn when its data shows gain" },
];

/** The `active` flag of a part block: automatic from the data, or set either way, with what the data shows. */
function ActivityField({
  scenario,
  block,
  parts,
  readOnly,
  commit,
}: {
  scenario: Scenario;
  block: WorkspaceBlock;
  parts: readonly PartSummary[];
  readOnly: boolean;
  commit: BlockInspectorProps["commit"];
}) {
  const part = findPart(block, parts);
  const value = block.active === true ? "active" : block.active === false ? "passive" : "auto";
  const hint = part?.active ? `Active by default: ${part.activeReason ?? "its data shows gain"}.` : part ? "Passive by default: its data shows no gain." : undefined;
  return (
    <Field label="Active or passive" hint={hint}>
      <Select
        value={value}
        disabled={readOnly}
        options={ACTIVITY_OPTIONS}
        onChange={(e) => {
          const v = e.target.value;
          if (v !== "auto") {
            commit(updateBlock(scenario, block.id, { active: v === "active" }, parts), `${block.id}.active`);
            return;
          }
          // automatic: the key goes, so that the saved scenario says nothing rather than `active: undefined`
          const blocks = scenario.blocks.map((b) => {
            if (b.id !== block.id) return b;
            const { active: _dropped, ...rest } = b;
            void _dropped;
            return rest;
          });
          commit({ ...scenario, blocks }, `${block.id}.active`);
        }}
      />
    </Field>
  );
}

function RenameForm({
  scenario,
  block,
  readOnly,
  commit,
  onRenamed,
}: {
  scenario: Scenario;
  block: WorkspaceBlock;
  readOnly: boolean;
  commit: BlockInspectorProps["commit"];
  onRenamed: BlockInspectorProps["onRenamed"];
}) {
  const [text, setText] = useState(block.id);
  const [error, setError] = useState<string | null>(null);
  const apply = () => {
    const to = text;
    if (to === block.id) return;
    const r = renameBlock(scenario, block.id, to);
    if (!r.ok) {
      setError(r.reason);
      return;
    }
    setError(null);
    commit(r.scenario);
    onRenamed(block.id, to);
  };
  return (
    <form
      aria-label="Rename block"
      className="flex items-end gap-2"
      onSubmit={(e) => {
        e.preventDefault();
        apply();
      }}
    >
      <Field label="Block id" error={error} className="flex-1">
        <Input
          value={text}
          disabled={readOnly}
          className="font-mono"
          autoComplete="off"
          spellCheck={false}
          onChange={(e) => {
            setText(e.target.value);
            setError(null);
          }}
          onBlur={apply}
        />
      </Field>
      <Button type="submit" variant="secondary" size="md" disabled={readOnly || text === block.id}>
        Rename
      </Button>
    </form>
  );
}

function ParamsSection({
  scenario,
  block,
  parts,
  readOnly,
  scope,
  commit,
}: {
  scenario: Scenario;
  block: WorkspaceBlock;
  parts: readonly PartSummary[];
  readOnly: boolean;
  scope: Map<string, unknown>;
  commit: BlockInspectorProps["commit"];
}) {
  const infos = paramsOf(block.kind);
  const fields = useMemo<ExpressionFieldSpec[]>(() => {
    const out: ExpressionFieldSpec[] = infos.map((info) => ({
      name: info.name,
      label: info.label,
      unit: info.unit,
      help: info.help,
      required: info.required,
      options: info.kind === "enum" ? info.options : undefined,
      placeholder:
        info.default === undefined ? (info.required ? undefined : "default") : info.default === null ? "∞ (default)" : `${valueToText(info.default)} (default)`,
      read: (text: string) => readParamInput(info, text, scope),
    }));
    out.push({
      name: RATING,
      label: "Rating",
      unit: "dBm",
      help: "The most power any port of this block may take (drive check). Accepts dBm or W.",
      placeholder: "none",
      read: (text: string) => {
        if (text.trim() === "") return { ok: true, value: undefined, display: "none" };
        return evaluateQuantity(text, "dBm", scope);
      },
    });
    return out;
  }, [infos, scope]);

  // the form keeps its own text after mount; it is re-created (keyed) on block change or undo
  const [initial] = useState(() => {
    const out: Record<string, string> = {};
    for (const info of infos) out[info.name] = block.expr?.[info.name] ?? valueToText(block.params?.[info.name]);
    out[RATING] = block.expr?.[RATING] ?? valueToText(block.rating_dbm);
    return out;
  });

  // Latest scenario for commits made from form callbacks.
  const onCommit = useCallback(
    (name: string, value: unknown, text: string) => {
      const current = getBlock(scenario, block.id);
      if (!current) return;
      const expr = { ...(current.expr ?? {}) };
      const typedNumber = text.trim() === valueToText(value);
      if (value === undefined || typedNumber) delete expr[name];
      else expr[name] = text.trim();
      const exprPatch = Object.keys(expr).length > 0 ? expr : undefined;
      let patch: Partial<WorkspaceBlock>;
      if (name === RATING) {
        patch = { rating_dbm: typeof value === "number" ? value : undefined, expr: exprPatch };
      } else {
        const params = { ...(current.params ?? {}) };
        if (value === undefined) delete params[name];
        else params[name] = value;
        patch = { params, expr: exprPatch };
        if (current.kind === "switch" && name === "throws" && typeof value === "number" && (current.state ?? 1) > value) patch.state = value;
      }
      const next = updateBlock(scenario, block.id, patch, parts);
      // drop keys set to undefined so that the saved JSON stays clean
      const cleaned: Scenario = {
        ...next,
        blocks: next.blocks.map((b) => (b.id === block.id ? (JSON.parse(JSON.stringify(b)) as WorkspaceBlock) : b)),
      };
      commit(cleaned, `${block.id}.${name}`);
    },
    [scenario, block.id, parts, commit],
  );

  const n = portCountOf(block, parts);
  return (
    <div className="flex flex-col gap-2">
      <h3 className="text-sm font-semibold text-ink">Parameters</h3>
      {infos.length === 0 && block.kind !== "touchstone" ? <p className="text-sm text-muted">This block takes no parameters.</p> : null}
      {block.kind === "touchstone" ? (
        <p className="text-sm text-muted">A part&apos;s behaviour comes from its data ({n} ports).</p>
      ) : null}
      <ExpressionForm label={`Parameters of ${block.id}`} fields={fields} initial={initial} disabled={readOnly} onCommit={onCommit} />
      <p className="text-xs text-muted">
        Fields take expressions with units, e.g. <span className="font-mono">2.45 GHz</span>, <span className="font-mono">0.12 dB/m * 3 m</span>, or
        project variables.
        {block.kind === "switch" ? ` Throw ${block.state ?? 1} selected.` : ""}
        {typeof block.rating_dbm === "number" ? ` Rating ${formatNumber(block.rating_dbm)} dBm.` : ""}
      </p>
      <PortNames scenario={scenario} blockId={block.id} labels={portLabelsOf(block, n)} />
    </div>
  );
}



/**
 * The block's ports as a group of tags, each with its number, its name where the kind names it
 * ("input", "throw 2") and what it meets (a link, a system port, or nothing). Wraps between tags rather
 * than inside one: the run-on "Ports: 1 1 · 2 2" line of a filter read as noise.
 */
function PortNames({ scenario, blockId, labels }: { scenario: Scenario; blockId: string; labels: string[] }) {
  if (labels.length === 0) return null;
  return (
    <div className="flex flex-col gap-1">
      <span className="text-xs font-semibold text-ink" id={`port-names-${blockId}`}>
        Port names
      </span>
      <ul className="flex flex-wrap gap-1.5" aria-labelledby={`port-names-${blockId}`} data-testid="port-names">
        {labels.map((label, k) => {
          const ref = formatPortRef(blockId, k + 1);
          const peer = linkedPeer(scenario, ref);
          const sys = systemPortAt(scenario, ref);
          const named = label !== String(k + 1);
          return (
            <li key={ref} className="whitespace-nowrap rounded border border-rule bg-surface px-1.5 py-0.5 text-xs text-ink">
              <span className="font-mono font-semibold">{k + 1}</span>
              {named ? ` ${label}` : ""}
              {peer ? ` → ${peer}` : sys ? ` = ${sys.name}` : " (free)"}
            </li>
          );
        })}
      </ul>
    </div>
  );
}
