import { formatHz } from "@/engine/format";

/** dB figures with a sign on margins, a true minus, and a dash for missing values. */
export function fmt(value: number | null | undefined, decimals = 2): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  const text = value.toFixed(decimals);
  // a value that rounds to zero is shown without a sign ("−0.00" reads as a loss)
  return Number(text) === 0 ? (0).toFixed(decimals) : text.replace("-", "−");
}

export function fmtMargin(value: number | null | undefined, decimals = 2): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  const size = Math.abs(value).toFixed(decimals);
  if (Number(size) === 0) return size;
  return `${value >= 0 ? "+" : "−"}${size}`;
}

export function fmtHz(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  return formatHz(value);
}
