/**
 * A small chart of one estimate over the recorded revisions: each revision's
 * estimate as a dot on its interval, revisions evenly spaced left to right
 * (labelled by the rows used when known), the earliest interval shaded across
 * the chart so a drift out of it shows at a glance. Plain SVG, drawn here:
 * the same in the live page and in the static record (no script).
 *
 * @module
 */
import type { VNode } from "preact";
import type { Trend } from "../kernel/history/types.ts";

const W = 232, H = 128;
const PAD = { left: 46, right: 10, top: 22, bottom: 22 };

/** A tick label: 4 significant digits, no trailing zeros. */
function tick(x: number): string {
  if (x === 0) return "0";
  const a = Math.abs(x);
  return a >= 1e-3 && a < 1e5 ? String(Number(x.toPrecision(4))) : x.toExponential(2);
}

/**
 * One series' drift chart.
 *
 * @param props The series (two points or more).
 * @returns An SVG figure with a caption.
 */
export function DriftChart(props: { trend: Trend }): VNode {
  const t = props.trend;
  const pts = t.points;
  const ys = pts.flatMap((p) => [p.value, p.lower, p.upper]).filter((v): v is number =>
    v !== null && Number.isFinite(v)
  );
  let lo = Math.min(...ys), hi = Math.max(...ys);
  if (!(hi > lo)) [lo, hi] = [lo - (Math.abs(lo) || 1) * 0.05, hi + (Math.abs(hi) || 1) * 0.05];
  const span = hi - lo;
  lo -= span * 0.08;
  hi += span * 0.08;
  const x = (i: number) =>
    PAD.left + (pts.length === 1 ? 0.5 : i / (pts.length - 1)) * (W - PAD.left - PAD.right);
  const y = (v: number) => PAD.top + (1 - (v - lo) / (hi - lo)) * (H - PAD.top - PAD.bottom);
  const first = pts[0];
  const line = pts.map((p, i) =>
    `${i === 0 ? "M" : "L"}${x(i).toFixed(1)},${y(p.value).toFixed(1)}`
  ).join("");
  const label = (i: number) => (pts[i].n !== null ? `n ${pts[i].n}` : `#${i + 1}`);
  const title = `${t.cell} · ${t.series}${t.unit ? ` (${t.unit})` : ""}`;
  return (
    <figure class="pl-drift-chart">
      <svg
        viewBox={`0 0 ${W} ${H}`}
        width={W}
        height={H}
        role="img"
        aria-label={`${title}: ${pts.map((p) => tick(p.value)).join(", ")}`}
      >
        <text x={PAD.left} y={13} class="pl-drift-title">{title}</text>
        {first.lower !== null && first.upper !== null && (
          <rect
            class="pl-drift-first"
            x={PAD.left}
            width={W - PAD.left - PAD.right}
            y={y(first.upper)}
            height={Math.max(1, y(first.lower) - y(first.upper))}
          />
        )}
        <line class="pl-drift-axis" x1={PAD.left} x2={PAD.left} y1={PAD.top} y2={H - PAD.bottom} />
        <text x={PAD.left - 4} y={y(hi - span * 0.08) + 4} class="pl-drift-tick" text-anchor="end">
          {tick(hi - span * 0.08)}
        </text>
        <text x={PAD.left - 4} y={y(lo + span * 0.08) + 4} class="pl-drift-tick" text-anchor="end">
          {tick(lo + span * 0.08)}
        </text>
        <path class="pl-drift-path" d={line} />
        {pts.map((p, i) => (
          <g key={p.record}>
            {p.lower !== null && p.upper !== null && (
              <line class="pl-drift-interval" x1={x(i)} x2={x(i)} y1={y(p.lower)} y2={y(p.upper)} />
            )}
            <circle class="pl-drift-dot" cx={x(i)} cy={y(p.value)} r={3} />
          </g>
        ))}
        <text x={x(0)} y={H - 6} class="pl-drift-tick" text-anchor="start">{label(0)}</text>
        <text x={x(pts.length - 1)} y={H - 6} class="pl-drift-tick" text-anchor="end">
          {label(pts.length - 1)}
        </text>
      </svg>
    </figure>
  );
}
