"use client";

import { Command } from "cmdk";
import type { BlockKind } from "@/engine/types";
import { ADDABLE_KINDS, kindSummary, kindTitle } from "@/lib/browser/catalogue";
import type { PartSummary } from "@/lib/browser/scenario-model";
import { NAME_SEPARATOR, rankBlockMatch } from "@/lib/browser/block-ranking";

export type AddBlockChoice = { kind: BlockKind; part?: PartSummary };

export type AddBlockPaletteProps = {
  open: boolean;
  onOpenChange: (open: boolean) => void;
  parts: readonly PartSummary[];
  /** called with the chosen kind (or part); the workspace places it at the viewport centre */
  onChoose: (choice: AddBlockChoice) => void;
};

/** Extra words a person may type for a kind (trade terms and common names). */
const KEYWORDS: Partial<Record<BlockKind, string[]>> = {
  filter: ["bandpass", "lowpass", "highpass", "bandstop", "butterworth", "chebyshev"],
  amplifier: ["gain", "lna", "pa"],
  line: ["cable", "trace", "feed"],
  antenna: ["radiator"],
  switch: ["spdt", "sp3t", "throw", "t/r"],
  splitter: ["divider", "combiner", "wilkinson"],
  load: ["termination"],
  attenuator: ["pad"],
  hybrid90: ["quadrature", "branch-line"],
  hybrid180: ["rat-race", "sum", "difference"],
  array: ["elements"],
  coupler: ["directional", "monitor"],
};

const itemClass =
  "flex cursor-pointer flex-col gap-0.5 rounded px-3 py-2 text-sm text-ink aria-selected:bg-ink aria-selected:text-on-ink data-[selected=true]:bg-ink data-[selected=true]:text-on-ink";

/** A filterable list of block kinds and parts: type to filter, arrows to move, Enter to add. */
export function AddBlockPalette({ open, onOpenChange, parts, onChoose }: AddBlockPaletteProps) {
  const choose = (choice: AddBlockChoice) => {
    onChoose(choice);
    onOpenChange(false);
  };
  return (
    <Command.Dialog
      open={open}
      onOpenChange={onOpenChange}
      // cmdk names its input after this label (aria-labelledby), so it says what the input does
      label="Filter block kinds and parts"
      // exact names (a part or a kind) above partial matches; cmdk keeps the best first and Enter adds it
      filter={rankBlockMatch}
      overlayClassName="fixed inset-0 z-40 bg-ink/25"
      contentClassName="fixed top-[12vh] left-1/2 z-50 w-[min(34rem,92vw)] -translate-x-1/2 rounded-card border-[1.5px] border-ink bg-surface shadow-xl"
    >
      <Command.Input
        placeholder="Block kind or part… (Enter adds it at the centre of the chart)"
        className="h-11 w-full border-b border-rule bg-transparent px-3 text-sm text-ink outline-none placeholder:text-muted"
      />
      <Command.List className="max-h-[55vh] overflow-y-auto p-1.5" aria-label="Block kinds and parts">
        <Command.Empty className="px-3 py-6 text-center text-sm text-muted">Nothing matches.</Command.Empty>
        <Command.Group heading="Built-in blocks" className="[&_[cmdk-group-heading]]:px-3 [&_[cmdk-group-heading]]:py-1 [&_[cmdk-group-heading]]:text-xs [&_[cmdk-group-heading]]:text-muted">
          {ADDABLE_KINDS.map((kind) => (
            <Command.Item key={kind} value={`${kindTitle(kind)}${NAME_SEPARATOR}${kind}`} keywords={KEYWORDS[kind]} onSelect={() => choose({ kind })} className={itemClass}>
              <span className="font-medium">{kindTitle(kind)}</span>
              <span className="text-xs opacity-75">{kindSummary(kind)}</span>
            </Command.Item>
          ))}
        </Command.Group>
        {parts.length > 0 ? (
          <Command.Group heading="Parts" className="[&_[cmdk-group-heading]]:px-3 [&_[cmdk-group-heading]]:py-1 [&_[cmdk-group-heading]]:text-xs [&_[cmdk-group-heading]]:text-muted">
            {parts.map((part) => (
              <Command.Item
                key={part.id}
                value={`${part.name}${NAME_SEPARATOR}${part.fileName}${NAME_SEPARATOR}part:${part.id}`}
                onSelect={() => choose({ kind: "touchstone", part })}
                className={itemClass}
              >
                <span className="font-medium">{part.name}</span>
                <span className="font-mono text-xs opacity-75">
                  {part.fileName} · {part.ports} port{part.ports === 1 ? "" : "s"}
                </span>
              </Command.Item>
            ))}
          </Command.Group>
        ) : null}
      </Command.List>
    </Command.Dialog>
  );
}
