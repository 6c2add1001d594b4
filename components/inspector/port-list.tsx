"use client";

import { useEffect, useRef, useState } from "react";
import type { PortRef, Scenario } from "@/engine/types";
import { Button, Input, Select } from "@/components/ui";
import { portLabelsOf } from "@/lib/browser/catalogue";
import { evaluateQuantity } from "@/lib/browser/expressions";
import { formatNumber } from "@/lib/browser/format";
import {
  addLink,
  formatPortRef,
  linkedPeer,
  nextSystemPortName,
  portCountOf,
  removeLinkAt,
  removeSystemPort,
  setSystemPort,
  systemPortAt,
  type PartSummary,
  type WorkspaceBlock,
} from "@/lib/browser/scenario-model";

export type PortListProps = {
  scenario: Scenario;
  block: WorkspaceBlock;
  parts: readonly PartSummary[];
  readOnly: boolean;
  commit: (next: Scenario, key?: string) => void;
  notify: (message: string) => void;
};

/** Every free block port of the scenario except `ref`: candidates for "link to…". */
function freePorts(scenario: Scenario, parts: readonly PartSummary[], except: PortRef): PortRef[] {
  const out: PortRef[] = [];
  for (const b of scenario.blocks) {
    const n = portCountOf(b, parts);
    for (let p = 1; p <= n; p++) {
      const ref = formatPortRef(b.id, p);
      if (ref !== except && !linkedPeer(scenario, ref) && !systemPortAt(scenario, ref)) out.push(ref);
    }
  }
  return out;
}

/**
 * The ports of the selected block, each linked, a system port or free, with the keyboard way to do
 * everything the chart does with the mouse: link to another port, unlink, mark or unmark a system port.
 */
export function PortList({ scenario, block, parts, readOnly, commit, notify }: PortListProps) {
  const n = portCountOf(block, parts);
  const labels = portLabelsOf(block, n);
  return (
    <div className="flex flex-col gap-2">
      <h3 className="text-sm font-semibold text-ink">Ports</h3>
      {n === 0 ? <p className="text-sm text-muted">The port count of this part is not known yet.</p> : null}
      <ul className="flex flex-col gap-2" aria-label={`Ports of ${block.id}`}>
        {Array.from({ length: n }, (_, k) => k + 1).map((port) => (
          <PortRow
            key={`${block.id}:${port}`}
            scenario={scenario}
            parts={parts}
            refId={formatPortRef(block.id, port)}
            label={labels[port - 1]}
            readOnly={readOnly}
            commit={commit}
            notify={notify}
          />
        ))}
      </ul>
    </div>
  );
}

function PortRow({
  scenario,
  parts,
  refId,
  label,
  readOnly,
  commit,
  notify,
}: {
  scenario: Scenario;
  parts: readonly PartSummary[];
  refId: PortRef;
  label: string | undefined;
  readOnly: boolean;
  commit: PortListProps["commit"];
  notify: PortListProps["notify"];
}) {
  const peer = linkedPeer(scenario, refId);
  const sys = systemPortAt(scenario, refId);
  // after linking from the select, the focus goes to this port's Unlink button (the select is gone)
  const unlinkRef = useRef<HTMLButtonElement>(null);
  const justLinked = useRef(false);
  useEffect(() => {
    if (peer && justLinked.current) {
      justLinked.current = false;
      unlinkRef.current?.focus();
    }
  }, [peer]);
  const title = `Port ${refId}${label && label !== refId.split(":").pop() ? ` (${label})` : ""}`;
  return (
    <li className="flex flex-col gap-1.5 rounded-card border border-rule bg-surface px-2.5 py-2" aria-label={title}>
      <div className="flex flex-wrap items-baseline justify-between gap-x-2 gap-y-0.5">
        <span className="min-w-0 font-mono text-sm break-words text-ink">{title}</span>
        <span className="text-xs text-muted">{peer ? `linked to ${peer}` : sys ? "system port" : "free (matched termination)"}</span>
      </div>
      {peer ? (
        <Button ref={unlinkRef} size="sm" variant="secondary" disabled={readOnly} onClick={() => commit(removeLinkAt(scenario, refId))} aria-label={`Unlink ${refId} from ${peer}`}>
          Unlink
        </Button>
      ) : sys ? (
        <SystemPortEditor key={`${sys.name}:${sys.z0 ?? ""}`} scenario={scenario} parts={parts} refId={refId} readOnly={readOnly} commit={commit} />
      ) : (
        <div className="flex flex-wrap items-center gap-2">
          <LinkTo
            scenario={scenario}
            parts={parts}
            refId={refId}
            readOnly={readOnly}
            commit={(next) => {
              justLinked.current = true;
              commit(next);
            }}
            notify={notify}
          />
          <Button
            size="sm"
            variant="secondary"
            disabled={readOnly}
            aria-label={`Mark ${refId} as a system port`}
            onClick={() => {
              const r = setSystemPort(scenario, refId, { name: nextSystemPortName(scenario) }, parts);
              if (r.ok) commit(r.scenario);
              else notify(r.reason);
            }}
          >
            Mark as system port
          </Button>
        </div>
      )}
    </li>
  );
}

function LinkTo({
  scenario,
  parts,
  refId,
  readOnly,
  commit,
  notify,
}: {
  scenario: Scenario;
  parts: readonly PartSummary[];
  refId: PortRef;
  readOnly: boolean;
  commit: PortListProps["commit"];
  notify: PortListProps["notify"];
}) {
  const options = freePorts(scenario, parts, refId);
  const [choice, setChoice] = useState("");
  // A closed select changes its value on arrow keys: from the keyboard a choice is only a choice until
  // Enter (or the Link button); with the mouse, picking an option links at once.
  const byKeyboard = useRef(false);
  const link = (target: string) => {
    if (!target) return;
    const r = addLink(scenario, refId, target, parts);
    setChoice("");
    if (r.ok) commit(r.scenario);
    else notify(r.reason);
  };
  return (
    <div className="flex min-w-44 flex-1 items-center gap-2">
      <label className="flex flex-1 items-center gap-2 text-xs text-muted">
        Link to
        <Select
          aria-label={`Link ${refId} to`}
          aria-description="Choose a port, then Enter links"
          disabled={readOnly || options.length === 0}
          value={choice}
          onPointerDown={() => {
            byKeyboard.current = false;
          }}
          onKeyDown={(e) => {
            if (e.key === "Enter") {
              if (choice) {
                e.preventDefault();
                link(choice);
              }
              return;
            }
            if (e.key !== "Tab") byKeyboard.current = true;
          }}
          onChange={(e) => {
            const target = e.target.value;
            if (byKeyboard.current) setChoice(target);
            else link(target);
          }}
          options={[{ value: "", label: options.length === 0 ? "no free port" : "choose a port…" }, ...options.map((o) => ({ value: o, label: o }))]}
        />
      </label>
      {choice ? (
        <Button size="sm" onClick={() => link(choice)} aria-label={`Link ${refId} to ${choice}`}>
          Link
        </Button>
      ) : null}
    </div>
  );
}

function SystemPortEditor({
  scenario,
  parts,
  refId,
  readOnly,
  commit,
}: {
  scenario: Scenario;
  parts: readonly PartSummary[];
  refId: PortRef;
  readOnly: boolean;
  commit: PortListProps["commit"];
}) {
  const sys = systemPortAt(scenario, refId);
  const [name, setName] = useState(sys?.name ?? "");
  const [z0Text, setZ0Text] = useState(sys?.z0 === undefined ? "" : String(sys.z0));
  const [error, setError] = useState<string | null>(null);
  if (!sys) return null;
  const apply = () => {
    let z0: number | undefined;
    if (z0Text.trim() !== "") {
      const r = evaluateQuantity(z0Text, "ohm");
      if (!r.ok || typeof r.value !== "number") {
        setError(r.ok ? "Z0 must be a real number of ohms." : r.error);
        return;
      }
      z0 = r.value;
    }
    if (name === sys.name && z0 === sys.z0) return;
    const r = setSystemPort(scenario, refId, { name, z0 }, parts);
    if (!r.ok) {
      setError(r.reason);
      return;
    }
    setError(null);
    commit(r.scenario);
  };
  return (
    <form
      className="flex flex-col gap-1.5"
      aria-label={`System port at ${refId}`}
      onSubmit={(e) => {
        e.preventDefault();
        apply();
      }}
    >
      <fieldset disabled={readOnly} className="flex flex-wrap items-center gap-2">
        <label className="flex items-center gap-1.5 text-xs text-muted">
          Name
          <span className="w-24">
            <Input aria-label={`System port name at ${refId}`} className="font-mono" value={name} onChange={(e) => setName(e.target.value)} onBlur={apply} />
          </span>
        </label>
        <label className="flex items-center gap-1.5 text-xs text-muted">
          Z0 (Ω)
          <span className="w-32">
          <Input
            aria-label={`System port Z0 at ${refId}`}
            className="font-mono"
            value={z0Text}
            placeholder={`${formatNumber(scenario.z0)} Ω`}
            title={`Blank: the scenario's Z0, ${formatNumber(scenario.z0)} Ω`}
            onChange={(e) => setZ0Text(e.target.value)}
            onBlur={apply}
          />
          </span>
        </label>
        <Button type="submit" size="sm" variant="secondary" aria-label={`Apply name and Z0 of ${refId}`}>
          Apply
        </Button>
        <Button size="sm" variant="ghost" aria-label={`Unmark system port ${sys.name}`} onClick={() => commit(removeSystemPort(scenario, refId))}>
          Unmark
        </Button>
      </fieldset>
      {error ? (
        <p role="alert" className="text-xs font-medium text-fail-strong">
          {error}
        </p>
      ) : null}
    </form>
  );
}
