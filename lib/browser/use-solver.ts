"use client";
/**
 * Solves the scenario in the engine worker after every change: debounced, with stale answers dropped by
 * sequence number. Falls back to solving on the main thread when Workers are unavailable.
 */
import { useCallback, useEffect, useLayoutEffect, useMemo, useRef, useState } from "react";
import type { Scenario } from "@/engine/types";
import { scenarioForEngine } from "@/lib/domain/scenarios/for-engine";
import { partTexts, type PartSummary } from "./scenario-model";
import type { SolveRequest, SolveResponse } from "./solve";

/** Wait after the last change before solving, ms. */
export const SOLVE_DEBOUNCE_MS = 150;

export type SolverState =
  | { status: "empty"; reason: "no-blocks" | "no-ports" }
  | { status: "solving"; last?: Extract<SolveResponse, { ok: true }> }
  | { status: "done"; result: Extract<SolveResponse, { ok: true }> }
  | { status: "error"; error: string; kind: string };

/** Why a scenario cannot be solved yet (null when it can be sent to the engine). */
export function emptyReason(scenario: Scenario): "no-blocks" | "no-ports" | null {
  if (scenario.blocks.length === 0) return "no-blocks";
  if (scenario.ports.length === 0) return "no-ports";
  return null;
}

/** A short key that changes when any text changes: names, lengths and a 32-bit FNV-1a of each text. */
function contentKey(texts: Record<string, string>): string {
  return Object.keys(texts)
    .sort()
    .map((file) => {
      const text = texts[file];
      let hash = 0x811c9dc5;
      for (let i = 0; i < text.length; i++) hash = Math.imul(hash ^ text.charCodeAt(i), 0x01000193);
      return `${file}:${text.length}:${(hash >>> 0).toString(16)}`;
    })
    .join("\n");
}

export function useSolver(scenario: Scenario, parts: readonly PartSummary[]): SolverState {
  const workerRef = useRef<Worker | null>(null);
  const seqRef = useRef(0);
  const lastOk = useRef<Extract<SolveResponse, { ok: true }> | undefined>(undefined);
  const [state, setState] = useState<SolverState>({ status: "solving" });
  const lastRequest = useRef<SolveRequest | null>(null);

  // no usable Worker: solve on the main thread (blocks the page while it runs)
  const solveHere = useCallback((request: SolveRequest) => {
    void import("./solve").then(({ runSolve }) => {
      const response = runSolve(request);
      if (response.seq !== seqRef.current) return;
      if (response.ok) {
        lastOk.current = response;
        setState({ status: "done", result: response });
      } else setState({ status: "error", error: response.error, kind: response.kind });
    });
  }, []);
  const texts = useMemo(() => partTexts(parts), [parts]);
  // the solve follows the texts' content, not the record's identity: the parts list is fetched again
  // after the page opens (SWR), and an equal record must not send a second solve that drops the first
  // one's answer (tests/bench/pages.ts)
  const textsKey = useMemo(() => contentKey(texts), [texts]);
  const latestTexts = useRef(texts);
  useLayoutEffect(() => {
    latestTexts.current = texts;
  }, [texts]);
  const reason = emptyReason(scenario);
  const engineScenario = useMemo(() => scenarioForEngine(scenario), [scenario]);
  const key = useMemo(() => JSON.stringify(engineScenario), [engineScenario]);
  const latest = useRef(engineScenario);
  useLayoutEffect(() => {
    latest.current = engineScenario;
  }, [engineScenario]);

  useEffect(() => {
    if (typeof Worker === "undefined") return;
    const worker = new Worker(new URL("./engine.worker.ts", import.meta.url), { type: "module" });
    workerRef.current = worker;
    worker.onmessage = (event: MessageEvent<SolveResponse>) => {
      const response = event.data;
      if (response.seq !== seqRef.current) return; // stale: a newer request is under way
      if (response.ok) {
        lastOk.current = response;
        setState({ status: "done", result: response });
      } else {
        setState({ status: "error", error: response.error, kind: response.kind });
      }
    };
    worker.onerror = (event) => {
      // the worker could not start or crashed: solve on the main thread from now on
      event.preventDefault();
      worker.terminate();
      workerRef.current = null;
      const pending = lastRequest.current;
      if (pending) solveHere(pending);
    };
    return () => {
      worker.terminate();
      workerRef.current = null;
    };
  }, [solveHere]);

  useEffect(() => {
    if (reason) return;
    const seq = ++seqRef.current;
    setState({ status: "solving", last: lastOk.current });
    const request: SolveRequest = { seq, scenario: latest.current, parts: latestTexts.current };
    lastRequest.current = request;
    const send = () => {
      const worker = workerRef.current;
      if (worker) {
        worker.postMessage(request); // queued by the browser until the worker's script has loaded
        return;
      }
      solveHere(request);
    };
    // the page's first solve goes at once (nobody is typing yet: tests/bench/pages.ts); edits wait
    if (seq === 1) {
      send();
      return;
    }
    const timer = window.setTimeout(send, SOLVE_DEBOUNCE_MS);
    return () => window.clearTimeout(timer);
  }, [key, textsKey, reason, solveHere]);

  if (reason) return { status: "empty", reason };
  return state;
}
