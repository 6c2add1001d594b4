import { cn } from "@/components/ui/cn";

type Point = { angle: number; length: number; width: number };

// Sixteen points: four long cardinals, four intercardinals, eight short by-points.
const points: Point[] = Array.from({ length: 16 }, (_, i) => {
  const angle = (i * Math.PI) / 8;
  if (i % 4 === 0) return { angle, length: 1, width: 0.22 };
  if (i % 2 === 0) return { angle, length: 0.7, width: 0.17 };
  return { angle, length: 0.5, width: 0.1 };
});

function polar(r: number, a: number): string {
  // Angle 0 points north (up), clockwise.
  return `${(Math.sin(a) * r).toFixed(3)},${(-Math.cos(a) * r).toFixed(3)}`;
}

export type CompassRoseProps = {
  /** Rendered size in pixels (width = height). */
  size?: number;
  className?: string;
  /** Accessible name; omit for a decorative rose. */
  title?: string;
};

/** Portolan's mark: a sixteen-point rose, each point split into a filled and an open half. */
export function CompassRose({ size = 28, className, title }: CompassRoseProps) {
  // Below about 32 px the by-points only blur the mark.
  const shown = size < 32 ? points.filter((_, i) => i % 2 === 0) : points;
  const ordered = [...shown].sort((a, b) => a.length - b.length);
  const stroke = size < 32 ? 0.06 : 0.03;
  return (
    <svg
      width={size}
      height={size}
      viewBox="-1.1 -1.1 2.2 2.2"
      className={cn("shrink-0 text-ink", className)}
      role={title ? "img" : undefined}
      aria-hidden={title ? undefined : true}
      aria-label={title}
    >
      <circle r="0.6" fill="none" stroke="currentColor" strokeWidth={stroke * 1.4} opacity="0.6" />
      {size >= 32 ? <circle r="0.72" fill="none" stroke="currentColor" strokeWidth="0.02" opacity="0.45" /> : null}
      {ordered.map((p) => {
        const tip = polar(p.length, p.angle);
        const left = polar(p.width, p.angle - Math.PI / 4);
        const right = polar(p.width, p.angle + Math.PI / 4);
        return (
          <g key={p.angle}>
            <polygon points={`0,0 ${tip} ${left}`} fill="currentColor" />
            <polygon points={`0,0 ${tip} ${right}`} fill="var(--pt-paper)" stroke="currentColor" strokeWidth={stroke} strokeLinejoin="round" />
          </g>
        );
      })}
      <circle r={size < 32 ? 0.1 : 0.07} fill="var(--pt-fail)" />
    </svg>
  );
}

export type WordmarkProps = { className?: string; roseSize?: number };

/** The rose and the word "Portolan". */
export function Wordmark({ className, roseSize = 26 }: WordmarkProps) {
  return (
    <span className={cn("inline-flex items-center gap-2 text-ink", className)}>
      <CompassRose size={roseSize} />
      <span className="text-lg font-semibold tracking-[0.08em] uppercase">Portolan</span>
    </span>
  );
}
