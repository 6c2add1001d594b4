import { MEASURED_TOLERANCE } from "@/engine/checks/data-quality";
import { maxSingularValue, reciprocityError } from "@/engine/linalg";
import { gainActivity } from "@/engine/system/activity";
import type { TouchstoneData } from "@/engine/touchstone";

/** A small |S| trace for the parts page: |S21| (|S11| for one-port data) in dB, at most 120 points. */
export type PartPreview = { label: string; hz: number[]; db: number[] };

/** Passivity and reciprocity figures of Touchstone data (Pozar, Microwave Engineering 4th ed., §4.3). */
export type PartFigures = { maxSingular: number; maxSingularHz: number; reciprocityError: number; reciprocityHz: number };

/**
 * A part's verdicts, the same the engine's data-quality check gives measured data
 * (engine/checks/data-quality.ts, docs/checks.md): σmax above 1 + MEASURED_TOLERANCE, or S ≠ Sᵀ beyond
 * it, is a warning, not a failure — an active or non-reciprocal measured device is possible (an
 * amplifier, an isolator), but usually a sign of calibration error.
 */
export type PartVerdicts = {
  passivity: "pass" | "warn";
  reciprocity: "pass" | "warn";
  /** the data shows gain (an amplifier): not expected passive or reciprocal, checked for stability instead */
  active: boolean;
  /** why the part counts as active (the engine's wording), null when it does not */
  activeReason: string | null;
};

export function partVerdicts(figures: Pick<PartFigures, "maxSingular" | "maxSingularHz" | "reciprocityError">): PartVerdicts {
  // the same rule and wording as the engine uses for a touchstone block without an `active` flag
  const activity = gainActivity(figures.maxSingular, figures.maxSingularHz);
  return {
    passivity: figures.maxSingular <= 1 + MEASURED_TOLERANCE ? "pass" : "warn",
    reciprocity: figures.reciprocityError <= MEASURED_TOLERANCE ? "pass" : "warn",
    active: activity !== null,
    activeReason: activity?.reason ?? null,
  };
}

/** Largest singular value and largest |S_ij − S_ji| over the data, and where (Pozar 4th ed., §4.3). */
export function partFigures(data: TouchstoneData): PartFigures {
  let maxSingular = 0;
  let maxSingularHz = data.frequencies[0];
  let recip = 0;
  let recipHz = data.frequencies[0];
  for (let k = 0; k < data.s.nf; k++) {
    const sv = maxSingularValue(data.s, k);
    if (sv > maxSingular) {
      maxSingular = sv;
      maxSingularHz = data.frequencies[k];
    }
    const r = reciprocityError(data.s, k);
    if (r > recip) {
      recip = r;
      recipHz = data.frequencies[k];
    }
  }
  return { maxSingular, maxSingularHz, reciprocityError: recip, reciprocityHz: recipHz };
}

/** |S21| (or |S11| for one-port data) in dB at up to `max` evenly spaced points of the data. */
export function partPreview(data: TouchstoneData, max = 120): PartPreview {
  const n = data.s.n;
  const [i, j] = n >= 2 ? [1, 0] : [0, 0];
  const step = Math.max(1, Math.ceil(data.s.nf / max));
  const hz: number[] = [];
  const db: number[] = [];
  for (let k = 0; k < data.s.nf; k += step) {
    const at = 2 * ((k * n + i) * n + j);
    const mag = Math.hypot(data.s.data[at], data.s.data[at + 1]);
    hz.push(data.frequencies[k]);
    db.push(mag > 0 ? 20 * Math.log10(mag) : -300);
  }
  return { label: n >= 2 ? "|S21|" : "|S11|", hz, db };
}
