"use client";

import { useEffect, useMemo, useState, type RefObject } from "react";
import { ConfirmDialog, Field, Textarea } from "@/components/ui";
import type { Scenario } from "@/engine/types";
import type { MergeChoice, MergeConflict } from "@/lib/domain/scenarios/merge";
import { summarizeChanges } from "@/lib/domain/scenarios/summary";

/**
 * "Save revision": a note (optional, but asked for: the history shows it) and, before saving, what the
 * revision will change against the draft's base in words. Enter in the note field is a new line;
 * the Save button or Ctrl/Cmd+S commits.
 */
export function SaveRevisionDialog({
  open,
  onClose,
  onSave,
  baseNumber,
  baseContent,
  draft,
  error,
  submitRef,
}: {
  open: boolean;
  onClose: () => void;
  onSave: (note: string) => Promise<void>;
  baseNumber: number;
  baseContent: Scenario;
  draft: Scenario;
  error: string | null;
  /** set to "commit now" while open: Ctrl/Cmd+S in the dialog saves */
  submitRef?: RefObject<(() => void) | null>;
}) {
  const [note, setNote] = useState("");
  useEffect(() => {
    if (!submitRef) return;
    submitRef.current = open ? () => void onSave(note).then(() => setNote("")) : null;
  }, [note, onSave, open, submitRef]);
  const changes = useMemo(() => (open ? summarizeChanges(baseContent, draft, baseNumber).changes : []), [open, baseContent, draft, baseNumber]);
  return (
    <ConfirmDialog
      open={open}
      onClose={onClose}
      onConfirm={async () => {
        await onSave(note);
        setNote("");
      }}
      title="Save revision"
      description={`A named revision that checks, verdicts and sign-off can refer to. Your working draft becomes revision ${baseNumber + 1} or later.`}
      confirmLabel="Save revision"
      tone="primary"
      error={error}
    >
      <Field label="Note" hint="What changed and why, in a line (optional; shown in the history).">
        <Textarea
          value={note}
          onChange={(e) => setNote(e.target.value)}
          rows={2}
          maxLength={2000}
          autoFocus
          placeholder="e.g. LNA gain raised to meet the receive budget"
          data-save-revision-note
        />
      </Field>
      <div className="text-sm">
        <p className="font-medium">Changes against r{baseNumber}</p>
        {changes.length === 0 ? (
          <p className="text-muted">No change to what the engine reads (positions and labels only, or none).</p>
        ) : (
          <ul aria-label="Changes in this revision" className="mt-1 max-h-40 list-disc overflow-y-auto pl-5 text-muted">
            {changes.map((c, i) => (
              <li key={i}>{c.text}</li>
            ))}
          </ul>
        )}
      </div>
    </ConfirmDialog>
  );
}

/**
 * The real conflicts of a save with a revision saved after the draft's base: one choice per conflict,
 * mine or theirs, both values shown in words. Everything else has merged by itself.
 */
export function MergeConflictDialog({
  conflicts,
  current,
  onClose,
  onResolve,
  error,
}: {
  conflicts: MergeConflict[] | null;
  current: { number: number; authorName: string | null } | null;
  onClose: () => void;
  onResolve: (resolutions: Record<string, MergeChoice>) => Promise<void>;
  error: string | null;
}) {
  const [choices, setChoices] = useState<Record<string, MergeChoice>>({});
  const [missing, setMissing] = useState(false);
  const list = conflicts ?? [];
  return (
    <ConfirmDialog
      open={conflicts !== null}
      onClose={() => {
        setChoices({});
        setMissing(false);
        onClose();
      }}
      onConfirm={async () => {
        if (list.some((c) => !choices[c.key])) {
          setMissing(true);
          return;
        }
        setMissing(false);
        await onResolve(choices);
        setChoices({});
      }}
      title="Choose yours or theirs"
      description={`Revision ${current?.number ?? "?"}${current?.authorName ? ` by ${current.authorName}` : ""} was saved after your draft started and changes the same ${list.length === 1 ? "thing" : "things"} as your draft. Everything else merges by itself.`}
      confirmLabel="Save merged revision"
      tone="primary"
      error={missing ? "Choose mine or theirs for each conflict." : error}
    >
      <div className="flex max-h-80 flex-col gap-3 overflow-y-auto">
        {list.map((c) => (
          <fieldset key={c.key} className="rounded border border-rule p-2" aria-label={`Conflict: ${c.label}`}>
            <legend className="px-1 text-sm font-medium">{c.label}</legend>
            {(["mine", "theirs"] as const).map((side) => (
              <label key={side} className="flex items-baseline gap-2 text-sm">
                <input type="radio" name={c.key} value={side} checked={choices[c.key] === side} onChange={() => setChoices((x) => ({ ...x, [c.key]: side }))} />
                <span>
                  {side === "mine" ? "Mine" : "Theirs"}: <span className="figures">{side === "mine" ? c.mine : c.theirs}</span>
                </span>
              </label>
            ))}
          </fieldset>
        ))}
      </div>
    </ConfirmDialog>
  );
}
