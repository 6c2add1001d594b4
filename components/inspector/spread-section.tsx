"use client";

import { useState } from "react";
import type { Scenario, SpreadSpec } from "@/engine/types";
import { PART_SPREAD_PARAMS } from "@/engine/spread/spec";
import { Input, Select } from "@/components/ui";
import { paramsOf } from "@/lib/browser/catalogue";
import { getBlock, updateBlock, type PartSummary, type WorkspaceBlock } from "@/lib/browser/scenario-model";

type Mode = "none" | "plus_minus" | "sigma";

/** The parameters of a block that may carry a spread, with their units (engine/spread/spec.ts). */
function spreadable(block: WorkspaceBlock): { name: string; label: string; unit: string }[] {
  if (block.kind === "touchstone") return PART_SPREAD_PARAMS.map((p) => ({ name: p, label: p === "mag_db" ? "Magnitude (all data)" : "Phase (all data)", unit: p === "mag_db" ? "dB" : "°" }));
  return paramsOf(block.kind)
    .filter((p) => p.kind === "number")
    .map((p) => ({ name: p.name, label: p.label, unit: p.unit ?? "" }));
}

const modeOf = (s: SpreadSpec | undefined): Mode => (!s ? "none" : "sigma" in s && s.sigma !== undefined ? "sigma" : "plus_minus");
const amountOf = (s: SpreadSpec | undefined): string => (!s ? "" : String("sigma" in s && s.sigma !== undefined ? s.sigma : (s as { plus_minus: number }).plus_minus));

/**
 * Spreads of a block for the spread analysis, one "±" row per numeric parameter: none, uniform ± x, or
 * normal with σ, in the parameter's unit (a part: dB and degrees on all its data; ± 180° is an unknown
 * phase). Written to the block's `spread` object exactly as the scenario format has it.
 */
export function SpreadSection({ scenario, block, parts, readOnly, commit }: { scenario: Scenario; block: WorkspaceBlock; parts: readonly PartSummary[]; readOnly: boolean; commit: (next: Scenario, key?: string) => void }) {
  const rows = spreadable(block);
  const [error, setError] = useState<string | null>(null);
  if (rows.length === 0) return null;

  function write(name: string, mode: Mode, amountText: string) {
    const current = getBlock(scenario, block.id);
    if (!current) return;
    const spread: Record<string, SpreadSpec> = { ...(current.spread ?? {}) };
    if (mode === "none") delete spread[name];
    else {
      const amount = Number(amountText.trim() === "" ? NaN : amountText);
      if (!Number.isFinite(amount) || amount <= 0) {
        setError(`Enter a positive number for the spread of ${name}.`);
        return;
      }
      spread[name] = mode === "sigma" ? { sigma: amount } : { plus_minus: amount };
    }
    setError(null);
    const next = updateBlock(scenario, block.id, { spread: Object.keys(spread).length > 0 ? spread : undefined }, parts);
    const cleaned: Scenario = { ...next, blocks: next.blocks.map((b) => (b.id === block.id ? (JSON.parse(JSON.stringify(b)) as WorkspaceBlock) : b)) };
    commit(cleaned, `${block.id}.spread.${name}`);
  }

  return (
    <div className="flex flex-col gap-2" aria-label={`Spreads of ${block.id}`} role="group">
      <h3 className="text-sm font-semibold text-ink">Spreads (±)</h3>
      {rows.map((r) => {
        const spec = block.spread?.[r.name];
        return (
          <SpreadRow key={`${block.id}:${r.name}:${modeOf(spec)}:${amountOf(spec)}`} label={r.label} name={r.name} unit={r.unit} mode={modeOf(spec)} amount={amountOf(spec)} readOnly={readOnly} onWrite={write} />
        );
      })}
      {error ? (
        <p role="alert" className="text-xs text-fail-strong">
          {error}
        </p>
      ) : null}
      <p className="text-xs text-muted">Uniform: value ± x; normal: standard deviation σ; in the parameter&apos;s unit. A phase of ± 180° is an unknown phase.</p>
    </div>
  );
}

function SpreadRow({ label, name, unit, mode, amount, readOnly, onWrite }: { label: string; name: string; unit: string; mode: Mode; amount: string; readOnly: boolean; onWrite: (name: string, mode: Mode, amount: string) => void }) {
  const [m, setM] = useState<Mode>(mode);
  const [text, setText] = useState(amount);
  return (
    <div className="grid grid-cols-[1fr_7rem_6rem] items-center gap-2 text-sm">
      <span>
        {label} <span className="text-muted">({unit || "—"})</span>
      </span>
      <Select
        aria-label={`Spread of ${name}`}
        value={m}
        disabled={readOnly}
        onChange={(e) => {
          const next = e.target.value as Mode;
          setM(next);
          if (next === "none") onWrite(name, "none", "");
          else if (text.trim() !== "") onWrite(name, next, text);
        }}
        options={[
          { value: "none", label: "none" },
          { value: "plus_minus", label: "± uniform" },
          { value: "sigma", label: "σ normal" },
        ]}
      />
      <Input
        aria-label={`Spread amount of ${name}`}
        numeric
        value={text}
        disabled={readOnly || m === "none"}
        placeholder={m === "none" ? "" : unit}
        onChange={(e) => setText(e.target.value)}
        onBlur={() => m !== "none" && onWrite(name, m, text)}
        onKeyDown={(e) => {
          if (e.key === "Enter" && m !== "none") onWrite(name, m, text);
        }}
      />
    </div>
  );
}
