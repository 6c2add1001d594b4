"use client";

import { useEffect, useSyncExternalStore } from "react";
import { expressionsReady, loadExpressions, subscribeExpressionsReady } from "./expressions";

/**
 * Start loading the expression reader (mathjs) once the component has painted, and re-render when it
 * has arrived: memos that evaluate expressions list the returned flag among their dependencies.
 */
export function useExpressionsReady(): boolean {
  useEffect(() => {
    void loadExpressions();
  }, []);
  return useSyncExternalStore(subscribeExpressionsReady, expressionsReady, () => false);
}
