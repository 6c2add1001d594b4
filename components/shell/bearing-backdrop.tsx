import { cn } from "@/components/ui/cn";

export type BearingBackdropProps = {
  className?: string;
  /** Where the main rose sits, as fractions of the width and height. */
  origin?: [number, number];
  /** Rhumb lines from the main rose. */
  lines?: 16 | 32;
  /** Draw the ring of smaller roses around the main one, each with its own sixteen lines. */
  ring?: boolean;
  /** Draw a small rose at the origin. */
  rose?: boolean;
};

const W = 1600;
const H = 1000;
const FAR = 4000;

function rays(cx: number, cy: number, count: number, offset = 0): string {
  let d = "";
  for (let i = 0; i < count; i++) {
    const a = offset + (i * 2 * Math.PI) / count;
    d += `M${cx.toFixed(1)} ${cy.toFixed(1)}L${(cx + Math.sin(a) * FAR).toFixed(1)} ${(cy - Math.cos(a) * FAR).toFixed(1)}`;
  }
  return d;
}

function smallRose(cx: number, cy: number, r: number): string {
  let d = "";
  for (let i = 0; i < 8; i++) {
    const a = (i * Math.PI) / 4;
    const len = i % 2 === 0 ? r : r * 0.6;
    const w = r * 0.14;
    const tipX = cx + Math.sin(a) * len;
    const tipY = cy - Math.cos(a) * len;
    const lx = cx + Math.sin(a - Math.PI / 2) * w;
    const ly = cy - Math.cos(a - Math.PI / 2) * w;
    const rx = cx + Math.sin(a + Math.PI / 2) * w;
    const ry = cy - Math.cos(a + Math.PI / 2) * w;
    d += `M${lx.toFixed(1)} ${ly.toFixed(1)}L${tipX.toFixed(1)} ${tipY.toFixed(1)}L${rx.toFixed(1)} ${ry.toFixed(1)}Z`;
  }
  return d;
}

/**
 * A faint web of bearing (rhumb) lines radiating from a compass rose, with an optional ring of lesser
 * roses, drawn in the rule colour behind charts and on the sign-in page. Purely decorative.
 */
export function BearingBackdrop({ className, origin = [0.5, 0.5], lines = 32, ring = true, rose = true }: BearingBackdropProps) {
  const cx = origin[0] * W;
  const cy = origin[1] * H;
  const ringRadius = 420;
  const satellites = ring
    ? Array.from({ length: 8 }, (_, i) => {
        const a = Math.PI / 8 + (i * Math.PI) / 4;
        return [cx + Math.sin(a) * ringRadius, cy - Math.cos(a) * ringRadius] as const;
      })
    : [];

  return (
    <svg
      aria-hidden="true"
      focusable="false"
      viewBox={`0 0 ${W} ${H}`}
      preserveAspectRatio="xMidYMid slice"
      className={cn("pointer-events-none absolute inset-0 h-full w-full select-none", className)}
      style={{ color: "var(--pt-backdrop)" }}
      data-testid="bearing-backdrop"
    >
      <g stroke="currentColor" fill="none">
        <path d={rays(cx, cy, lines)} strokeWidth="0.9" opacity="0.55" vectorEffect="non-scaling-stroke" />
        <path d={rays(cx, cy, 4)} strokeWidth="1.3" opacity="0.6" vectorEffect="non-scaling-stroke" />
        {satellites.map(([x, y]) => (
          <path key={`${x.toFixed(0)}-${y.toFixed(0)}`} d={rays(x, y, 16)} strokeWidth="0.7" opacity="0.32" vectorEffect="non-scaling-stroke" />
        ))}
        {ring ? <circle cx={cx} cy={cy} r={ringRadius} strokeWidth="0.8" opacity="0.5" strokeDasharray="2 6" /> : null}
      </g>
      <g fill="currentColor" opacity="0.7">
        {satellites.map(([x, y]) => (
          <circle key={`d-${x.toFixed(0)}-${y.toFixed(0)}`} cx={x} cy={y} r="3" />
        ))}
      </g>
      {rose ? (
        <g>
          <circle cx={cx} cy={cy} r="46" fill="none" stroke="currentColor" strokeWidth="1.2" opacity="0.75" />
          <path d={smallRose(cx, cy, 64)} fill="currentColor" opacity="0.8" />
        </g>
      ) : null}
    </svg>
  );
}
