"use client";

import { createContext, useCallback, useContext, useEffect, useMemo, useRef, useState, type ReactNode } from "react";
import type { BlockKind, PortRef, Scenario } from "@/engine/types";
import type { Role } from "@/lib/base/permission-table";
import type { PartSummary } from "@/lib/browser/scenario-model";
import type { CheckName } from "@/lib/domain/checks/inputs";

/**
 * What a scenario page lends the helm while it is on screen: the scenario being edited, the viewer's
 * role (from the server) and the workspace's actions. Actions a role may not do are left out by the
 * helm, and the server refuses them anyway.
 */
export type HelmScenarioActions = {
  projectId: string;
  scenarioId: string;
  scenarioName: string;
  role: Role;
  /** the revision the page shows (checks run on it) */
  revisionId: string;
  revisionNumber: number;
  /** the scenario as edited (defaults for ports, bands and switch states come from it) */
  scenario: Scenario;
  parts: readonly PartSummary[];
  addBlock: (kind: BlockKind, part?: PartSummary) => void;
  markSystemPort: (at: PortRef, name: string) => void;
  setSwitchState: (blockId: string, state: number) => void;
  saveRevision: () => void;
  duplicateScenario: () => Promise<void>;
  downloadTouchstone: () => void;
  exportBundle: () => void;
  runCheck: (check: CheckName, inputs: Record<string, unknown>) => Promise<void>;
};

type HelmRegistry = {
  /** the scenario page's actions, or null elsewhere (a ref: registering must not re-render the page) */
  current: () => HelmScenarioActions | null;
  register: (actions: HelmScenarioActions | null) => void;
  /** bumps when a scenario page registers or leaves, so the helm re-reads `current` */
  version: number;
  open: boolean;
  setOpen: (open: boolean) => void;
  /** a page shows its own helm button (the workspace toolbar), so the floating one stays away */
  docked: boolean;
  /** the Helm lends its "open afresh" here, for the docked buttons */
  setOpener: (open: (() => void) | null) => void;
};

type HelmOpener = { open: () => void; dock: () => () => void };

const RegistryContext = createContext<HelmRegistry | null>(null);
const RegisterContext = createContext<((actions: HelmScenarioActions | null) => void) | null>(null);
const OpenerContext = createContext<HelmOpener | null>(null);

/** Holds the helm's state for every signed-in page; mounted once in the workspace layout. */
export function HelmProvider({ children }: { children: ReactNode }) {
  const ref = useRef<HelmScenarioActions | null>(null);
  const [version, setVersion] = useState(0);
  const [open, setOpen] = useState(false);
  const register = useCallback((actions: HelmScenarioActions | null) => {
    const hadOne = ref.current !== null;
    ref.current = actions;
    if (hadOne !== (actions !== null)) setVersion((v) => v + 1);
  }, []);
  const openerRef = useRef<(() => void) | null>(null);
  const [docks, setDocks] = useState(0);
  const setOpener = useCallback((fn: (() => void) | null) => {
    openerRef.current = fn;
  }, []);
  const opener = useMemo<HelmOpener>(
    () => ({
      open: () => (openerRef.current ? openerRef.current() : setOpen(true)),
      dock: () => {
        setDocks((n) => n + 1);
        return () => setDocks((n) => n - 1);
      },
    }),
    [],
  );
  const value = useMemo<HelmRegistry>(
    () => ({ current: () => ref.current, register, version, open, setOpen, docked: docks > 0, setOpener }),
    [register, version, open, docks, setOpener],
  );
  return (
    <RegisterContext.Provider value={register}>
      <OpenerContext.Provider value={opener}>
        <RegistryContext.Provider value={value}>{children}</RegistryContext.Provider>
      </OpenerContext.Provider>
    </RegisterContext.Provider>
  );
}

/** The helm's own view of the registry (the Helm component). */
export function useHelmRegistry(): HelmRegistry {
  const value = useContext(RegistryContext);
  if (!value) throw new Error("useHelmRegistry needs a <HelmProvider> above it");
  return value;
}

/**
 * Lend the scenario page's actions to the helm while the page is mounted. Safe to call with a new object
 * on every render: it is kept in a ref. Does nothing without a HelmProvider (e.g. in unit tests).
 */
export function useHelmScenario(actions: HelmScenarioActions | null): void {
  const register = useContext(RegisterContext);
  useEffect(() => {
    register?.(actions);
  });
  useEffect(() => () => register?.(null), [register]);
}

/**
 * For a page that shows its own helm button: returns what opens the helm (null without a HelmProvider,
 * e.g. in unit tests) and, while mounted, keeps the floating helm button away.
 */
export function useHelmOpener(): (() => void) | null {
  const opener = useContext(OpenerContext);
  useEffect(() => opener?.dock(), [opener]);
  return opener?.open ?? null;
}
