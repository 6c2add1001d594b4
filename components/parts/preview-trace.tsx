import { formatHz } from "@/engine/format";

/** A small inline trace of a part's |S21| (or |S11|) in dB over its frequency range. */
export function PreviewTrace({ label, hz, db, width = 160, height = 44 }: { label: string; hz: number[]; db: number[]; width?: number; height?: number }) {
  if (hz.length === 0) return <span className="text-xs text-muted">no preview</span>;
  const finite = db.map((v) => (Number.isFinite(v) ? Math.max(v, -120) : -120));
  let lo = Math.min(...finite);
  let hi = Math.max(...finite);
  if (hi - lo < 1) {
    lo -= 0.5;
    hi += 0.5;
  }
  const f0 = hz[0];
  const f1 = hz[hz.length - 1] === f0 ? f0 + 1 : hz[hz.length - 1];
  const pad = 2;
  const x = (f: number) => pad + ((f - f0) / (f1 - f0)) * (width - 2 * pad);
  const y = (v: number) => pad + ((hi - v) / (hi - lo)) * (height - 2 * pad);
  const points = hz.map((f, k) => `${x(f).toFixed(1)},${y(finite[k]).toFixed(1)}`).join(" ");
  const description = `${label} in dB from ${formatHz(hz[0])} to ${formatHz(hz[hz.length - 1])}: between ${lo.toFixed(1)} and ${hi.toFixed(1)} dB`;
  return (
    <svg width={width} height={height} viewBox={`0 0 ${width} ${height}`} role="img" aria-label={description} className="rounded-sm border border-rule bg-paper">
      <title>{description}</title>
      <line x1={pad} x2={width - pad} y1={height - pad} y2={height - pad} className="stroke-rule" strokeWidth={1} />
      <polyline points={hz.length === 1 ? `${points} ${points}` : points} fill="none" className="stroke-sea" strokeWidth={1.5} strokeLinejoin="round" />
    </svg>
  );
}
