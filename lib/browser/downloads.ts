/**
 * Files the results panel offers: the composite as Touchstone and as CSV, and the browser download.
 */
import { writeTouchstone } from "@/engine/touchstone";
import type { SolvedView } from "@/lib/domain/results/results-math";

/**
 * Touchstone text of the composite, RI in GHz: version 1.1 when every system port has the same Z0,
 * else 2.0 with per-port references (the writer's choice). Port names go in comment lines.
 */
export function compositeTouchstone(view: SolvedView, scenarioName: string): string {
  const same = view.portZ0.every((z) => z === view.portZ0[0]);
  const z0 = same ? view.portZ0[0] : Float64Array.from(view.portZ0.flatMap((z) => [z, 0]));
  return writeTouchstone(
    {
      frequencies: view.frequencies,
      s: view.s,
      z0,
      comments: [`Composite of scenario "${scenarioName}"`, `Ports: ${view.ports.map((p, k) => `${k + 1}=${p}`).join(" ")}`],
    },
    { format: "RI", unit: "GHz" },
  );
}

/** Offers `text` as a file download (Blob + temporary link). Browser only. */
export function downloadText(name: string, text: string, type: string): void {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const a = document.createElement("a");
  a.href = url;
  a.download = name;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}
