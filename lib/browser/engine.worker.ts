/**
 * The engine in a Web Worker, so that solving never blocks the page. Messages in: SolveRequest;
 * messages out: SolveResponse (typed arrays copied once, then transferred).
 */
import { z } from "zod";
import { runSolve, type SolveRequest, type SolveResponse } from "./solve";

// The Content-Security-Policy forbids eval: keep zod from probing for it (it would be reported as a violation).
z.config({ jitless: true });

// The project compiles with the DOM library; only these two members of the worker scope are used.
type WorkerScope = {
  onmessage: ((event: MessageEvent<SolveRequest>) => void) | null;
  postMessage: (message: SolveResponse, transfer?: Transferable[]) => void;
};

const scope = self as unknown as WorkerScope;

scope.onmessage = (event) => {
  const response = runSolve(event.data);
  if (!response.ok) {
    scope.postMessage(response);
    return;
  }
  // copies: the engine may keep its own arrays (caches), which a transfer would detach
  const frequencies = response.view.frequencies.slice();
  const data = response.view.s.data.slice();
  const view = { ...response.view, frequencies, s: { ...response.view.s, data } };
  scope.postMessage({ ...response, view }, [frequencies.buffer, data.buffer]);
};
