"use client";

import { useMemo, useState } from "react";
import type { Scenario } from "@/engine/types";
import { Button, Select } from "@/components/ui";
import { ADDABLE_KINDS, kindTitle } from "@/lib/browser/catalogue";
import { describeDropped, replaceBlock, type ReplaceChoice } from "@/lib/browser/replace-block";
import { defaultParams, portCountOf, type PartSummary, type WorkspaceBlock } from "@/lib/browser/scenario-model";

type Option = { value: string; label: string; choice: ReplaceChoice; ports: number };

/**
 * "Replace…": another kind or part in this block's place, keeping its id, links and system ports. Choices
 * with at least as many ports come first; anything that would be dropped is listed before and after.
 */
/** What the inspector's tools for one block (replace, move to a newer part version) are given. */
export type BlockToolProps = {
  scenario: Scenario;
  block: WorkspaceBlock;
  parts: readonly PartSummary[];
  readOnly: boolean;
  commit: (next: Scenario, key?: string) => void;
  notify: (message: string) => void;
};

export function ReplaceForm({ scenario, block, parts, readOnly, commit, notify }: BlockToolProps) {
  const [open, setOpen] = useState(false);
  const [value, setValue] = useState("");
  const have = portCountOf(block, parts);
  const options = useMemo<Option[]>(() => {
    const kinds: Option[] = ADDABLE_KINDS.filter((k) => k !== block.kind).map((k) => ({
      value: `kind:${k}`,
      label: kindTitle(k),
      choice: { kind: k },
      ports: portCountOf({ id: "x", kind: k, params: defaultParams(k, scenario) }, parts),
    }));
    const fromParts: Option[] = parts
      .filter((p) => !(block.kind === "touchstone" && block.file === `parts/${p.fileName}`))
      .map((p) => ({ value: `part:${p.id}`, label: `${p.name} (part)`, choice: { kind: "touchstone", part: p }, ports: p.ports }));
    const all = [...kinds, ...fromParts];
    // enough ports first: those keep every link
    return [...all.filter((o) => o.ports >= have), ...all.filter((o) => o.ports < have)];
  }, [block, parts, scenario, have]);
  const chosen = options.find((o) => o.value === value);
  const preview = chosen ? replaceBlock(scenario, block.id, chosen.choice, parts) : null;
  const dropped = preview && preview.ok ? describeDropped(preview) : null;

  if (!open) {
    return (
      <div>
        <Button size="sm" variant="secondary" disabled={readOnly} onClick={() => setOpen(true)} aria-label={`Replace ${block.id}…`}>
          Replace…
        </Button>
      </div>
    );
  }
  return (
    <form
      aria-label={`Replace ${block.id}`}
      className="flex flex-col gap-2 rounded-card border border-rule bg-surface px-2.5 py-2"
      onSubmit={(e) => {
        e.preventDefault();
        if (!chosen) return;
        const r = replaceBlock(scenario, block.id, chosen.choice, parts);
        if (!r.ok) {
          notify(r.reason);
          return;
        }
        commit(r.scenario);
        const note = describeDropped(r);
        notify(`${block.id} is now ${chosen.label}; links and system ports kept.${note ? ` ${note}` : ""} Undo with Ctrl+Z.`);
        setOpen(false);
        setValue("");
      }}
    >
      <label className="flex flex-col gap-1 text-xs text-muted">
        Replace {block.id} ({have} port{have === 1 ? "" : "s"}) with
        <Select aria-label={`Replace ${block.id} with`} value={value} onChange={(e) => setValue(e.target.value)}>
          <option value="">choose a kind or part…</option>
          {options.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label} · {o.ports} port{o.ports === 1 ? "" : "s"}
            </option>
          ))}
        </Select>
      </label>
      {dropped ? (
        <p className="text-xs font-medium text-warn-strong" data-testid="replace-drops">
          {dropped}
        </p>
      ) : chosen ? (
        <p className="text-xs text-muted">Every link and system port is kept.</p>
      ) : null}
      <div className="flex gap-2">
        <Button type="submit" size="sm" disabled={!chosen || readOnly}>
          Replace
        </Button>
        <Button size="sm" variant="ghost" onClick={() => setOpen(false)}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
