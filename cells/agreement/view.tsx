/**
 * The agreement cell's view: the verdict first, then the two regression
 * lines with their labelled intervals, the linearity test, the agreement of
 * the differences (bias, limits and their intervals) with the agreement
 * plot, and the two methods' readings against each other. Plain markup and
 * SVG drawn here (no script), shared by the live page and the record.
 *
 * The plots are ours: differences against means as open rings, the bias as
 * a solid rule in the accent colour, the limits as dashed rules, each rule's
 * confidence interval a pale band behind it, the zero line faint, every rule
 * named at its right end (shape and words, never colour alone). Like every
 * chart of the page, a plot takes the column's width and never less than
 * 30rem; narrower, its figure scrolls in itself.
 *
 * @module
 */
import type { VNode } from "preact";
import type { PageFace, ViewProps } from "../../kernel/contract/mod.ts";
import type { AgreementResult, Estimated } from "./result.ts";
import { formatEstimated, roundingScale } from "./_format.ts";
import { formatEstimate, formatNumber, formatP, withUnit } from "../shared/format.ts";
import { FAINT_INK, INK } from "../shared/palette.ts";

const ACCENT = "var(--accent, #0b5cad)";

/**
 * Renders an agreement result.
 *
 * @param props The cell name and its summary.
 * @returns The block's content.
 */
export function AgreementView({ name, result: r }: ViewProps<AgreementResult>): VNode {
  const pct = `${formatNumber(100 * r.confidence, 4)}%`;
  return (
    <section class="plumb-agreement" aria-label={`Method comparison ${name}`}>
      <p class="plumb-agreement-what">
        <code>{r.y}</code> against <code>{r.x}</code>: {r.n} samples
        {r.replicated ? ` (${r.rows_used} rows, replicates averaged per sample)` : ""}.
      </p>
      <p class="plumb-agreement-verdict">{r.verdict.sentence}.</p>
      <table class="plumb-agreement-lines">
        <caption>Lines y = a + b·x, {pct} intervals</caption>
        <thead>
          <tr>
            {["Regression", "Intercept a", "Slope b", "Intervals by"].map((h) => (
              <th scope="col" key={h}>{h}</th>
            ))}
          </tr>
        </thead>
        <tbody>
          <LineRow
            label={r.deming.weighted ? "Deming, weighted" : "Deming"}
            a={r.deming.intercept}
            b={r.deming.slope}
            unit={r.unit}
          />
          <LineRow
            label="Passing–Bablok"
            a={r.passing_bablok.intercept}
            b={r.passing_bablok.slope}
            unit={r.unit}
          />
        </tbody>
      </table>
      <p class="plumb-agreement-notes">
        {ratioNote(r)} {linearityNote(r)}
      </p>
      <AgreementPlot r={r} />
      <MethodsPlot r={r} />
      <dl class="plumb-agreement-statistics">
        {statistics(r).map(([term, value]) => [
          <dt key={`t-${term}`}>{term}</dt>,
          <dd key={`d-${term}`}>{value}</dd>,
        ])}
      </dl>
      <p class="plumb-agreement-rounding">
        Estimates and limits are given to the digit of the standard error's second significant
        figure (GUM §7.2.6), or of a quarter of the interval's width where the method gives no
        standard error.
      </p>
    </section>
  );
}

function LineRow(props: { label: string; a: Estimated; b: Estimated; unit: string | null }) {
  return (
    <tr>
      <th scope="row">{props.label}</th>
      <td>{withUnit(formatEstimated(props.a), props.unit)}</td>
      <td>{formatEstimated(props.b)}</td>
      <td>{props.b.intervals[0]?.method}</td>
    </tr>
  );
}

function ratioNote(r: AgreementResult): string {
  const v = r.variance_ratio;
  const what = r.errors === "proportional" ? "squared CVs" : "error variances";
  const ratio = `Ratio of ${what}, y's over x's: ${formatNumber(v.value, 4)}`;
  if (v.source === "given") return `${ratio} (given).`;
  return `${ratio}, estimated from ${v.replicated_samples} replicated samples (${v.df} degrees of freedom).`;
}

function linearityNote(r: AgreementResult): string {
  const t = r.passing_bablok.linearity;
  if (t === null) return "The cusum test of linearity was not made: every point lies on one side.";
  return `Cusum test of linearity: largest cumulative score ${
    formatNumber(t.statistic, 3)
  } against ${formatNumber(t.critical, 3)} (p ${formatP(t.p_value)}): ${
    t.linear ? "a straight line holds" : "the relation is not a straight line"
  }.`;
}

function statistics(r: AgreementResult): [string, string][] {
  const a = r.agreement;
  const scale = a.differences === "percent" ? "percent of the pair's mean" : "y − x";
  return [
    ["Differences", scale],
    ["Bias (mean difference)", withUnit(formatEstimated(a.bias), a.unit)],
    [
      `Limits of agreement (${formatNumber(100 * a.share, 4)}% of differences, ±${
        formatNumber(a.z, 4)
      } SD)`,
      `${withUnit(formatEstimated(a.lower), a.unit)} and ${
        withUnit(formatEstimated(a.upper), a.unit)
      }`,
    ],
    ["Interval of the limits by", a.lower.intervals[0]?.method ?? "—"],
    ["SD of one difference", withUnit(formatNumber(a.sd, 4), a.unit)],
    ["Rows compared", String(r.rows_used)],
  ];
}

const W = 640, H = 300, L = 58, R = 104, T = 14, B = 40;

/** Evenly spaced round values across [lo, hi]. */
function ticks(lo: number, hi: number, count = 5): number[] {
  const span = hi - lo || Math.abs(hi) || 1;
  const raw = span / count, mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const out: number[] = [];
  for (let v = Math.ceil(lo / step) * step; v <= hi + step * 1e-9; v += step) {
    out.push(Math.abs(v) < step * 1e-9 ? 0 : v);
  }
  return out;
}

interface Frame {
  sx: (v: number) => number;
  sy: (v: number) => number;
  x: [number, number];
  y: [number, number];
}

function frame(xs: number[], ys: number[]): Frame {
  const pad = (lo: number, hi: number): [number, number] => {
    const d = (hi - lo) * 0.06 || Math.abs(hi) * 0.1 || 1;
    return [lo - d, hi + d];
  };
  const x = pad(Math.min(...xs), Math.max(...xs)), y = pad(Math.min(...ys), Math.max(...ys));
  return {
    x,
    y,
    sx: (v) => L + ((v - x[0]) / (x[1] - x[0])) * (W - L - R),
    sy: (v) => H - B - ((v - y[0]) / (y[1] - y[0])) * (H - T - B),
  };
}

/** Axes with ticks and labels. */
function Axes(props: { f: Frame; xLabel: string; yLabel: string }): VNode {
  const { f } = props;
  const text = { "font-size": "11", fill: INK };
  return (
    <g class="plumb-agreement-axes">
      <rect
        x={L}
        y={T}
        width={W - L - R}
        height={H - T - B}
        fill="none"
        stroke={FAINT_INK}
      />
      {ticks(f.x[0], f.x[1]).map((v) => (
        <text key={`x${v}`} x={f.sx(v)} y={H - B + 14} text-anchor="middle" {...text}>
          {formatNumber(v, 4)}
        </text>
      ))}
      {ticks(f.y[0], f.y[1]).map((v) => (
        <text key={`y${v}`} x={L - 5} y={f.sy(v) + 4} text-anchor="end" {...text}>
          {formatNumber(v, 4)}
        </text>
      ))}
      <text x={(L + W - R) / 2} y={H - 6} text-anchor="middle" {...text}>{props.xLabel}</text>
      <text
        x={12}
        y={(T + H - B) / 2}
        text-anchor="middle"
        transform={`rotate(-90 12 ${(T + H - B) / 2})`}
        {...text}
      >
        {props.yLabel}
      </text>
    </g>
  );
}

/** Differences against means, with the bias and limits and their intervals. */
function AgreementPlot({ r }: { r: AgreementResult }): VNode {
  const a = r.agreement;
  const rules: { key: string; e: Estimated; dash: string | undefined; label: string }[] = [
    { key: "upper", e: a.upper, dash: "6 4", label: "upper limit" },
    { key: "bias", e: a.bias, dash: undefined, label: "bias" },
    { key: "lower", e: a.lower, dash: "6 4", label: "lower limit" },
  ];
  const ys = [...r.differences, 0];
  for (const { e } of rules) {
    ys.push(e.estimate);
    for (const i of e.intervals) for (const v of [i.lower, i.upper]) if (v !== null) ys.push(v);
  }
  const f = frame(r.means, ys);
  const x0 = L, x1 = W - R;
  const dUnit = a.unit ? ` (${a.unit})` : "";
  return (
    <figure class="plumb-agreement-plot">
      <svg
        viewBox={`0 0 ${W} ${H}`}
        role="img"
        aria-label={`Differences of ${r.y} and ${r.x} against their means, with the bias and limits of agreement`}
        style="width:100%;min-width:30rem;height:auto;display:block"
      >
        {rules.map(({ key, e }) => {
          const i = e.intervals[0];
          if (i === undefined || i.lower === null || i.upper === null) return null;
          return (
            <rect
              key={`band-${key}`}
              x={x0}
              width={x1 - x0}
              y={f.sy(i.upper)}
              height={Math.max(1, f.sy(i.lower) - f.sy(i.upper))}
              fill={key === "bias" ? ACCENT : INK}
              fill-opacity="0.1"
            />
          );
        })}
        <line x1={x0} x2={x1} y1={f.sy(0)} y2={f.sy(0)} stroke={FAINT_INK} />
        <Axes
          f={f}
          xLabel={`mean of ${r.x} and ${r.y}${r.unit ? ` (${r.unit})` : ""}`}
          yLabel={`${a.differences === "percent" ? "difference, % of mean" : `${r.y} − ${r.x}`}${
            a.differences === "percent" ? "" : dUnit
          }`}
        />
        {r.means.map((m, k) => (
          <circle
            key={k}
            cx={f.sx(m)}
            cy={f.sy(r.differences[k])}
            r="3"
            fill="none"
            stroke={INK}
          >
            <title>
              row {r.rows[k]}: mean {formatNumber(m, 5)}, difference{" "}
              {formatNumber(r.differences[k], 4)}
            </title>
          </circle>
        ))}
        {rules.map(({ key, e, dash, label }) => (
          <g key={key}>
            <line
              x1={x0}
              x2={x1}
              y1={f.sy(e.estimate)}
              y2={f.sy(e.estimate)}
              stroke={key === "bias" ? ACCENT : INK}
              stroke-width={key === "bias" ? 2 : 1.25}
              stroke-dasharray={dash}
            />
            <text x={x1 + 4} y={f.sy(e.estimate) - 2} font-size="11" fill={INK}>{label}</text>
            <text x={x1 + 4} y={f.sy(e.estimate) + 11} font-size="11" fill={INK}>
              {formatEstimate(e.estimate, roundingScale(e))}
            </text>
          </g>
        ))}
      </svg>
      <figcaption>
        Differences against means, one ring per row; the bands behind the rules are their{" "}
        {formatNumber(100 * r.confidence, 4)}% intervals.
      </figcaption>
    </figure>
  );
}

/** The sample means of y against x with the line of identity and both lines. */
function MethodsPlot({ r }: { r: AgreementResult }): VNode {
  const xs = r.sample_x, ys = r.sample_y;
  const lo = Math.min(...xs, ...ys), hi = Math.max(...xs, ...ys);
  const f = frame([lo, hi], [lo, hi]);
  const seg = (a: number, b: number) => {
    const x0 = f.x[0], x1 = f.x[1];
    return { x1: f.sx(x0), y1: f.sy(a + b * x0), x2: f.sx(x1), y2: f.sy(a + b * x1) };
  };
  const u = r.unit ? ` (${r.unit})` : "";
  const lines = [
    { key: "identity", a: 0, b: 1, dash: "2 3", color: FAINT_INK, label: "y = x" },
    {
      key: "deming",
      a: r.deming.intercept.estimate,
      b: r.deming.slope.estimate,
      dash: undefined,
      color: ACCENT,
      label: "Deming",
    },
    {
      key: "pb",
      a: r.passing_bablok.intercept.estimate,
      b: r.passing_bablok.slope.estimate,
      dash: "7 3",
      color: INK,
      label: "Passing–Bablok",
    },
  ];
  return (
    <figure class="plumb-agreement-plot">
      <svg
        viewBox={`0 0 ${W} ${H}`}
        role="img"
        aria-label={`${r.y} against ${r.x} with the line of identity and both regression lines`}
        style="width:100%;min-width:30rem;height:auto;display:block"
      >
        <defs>
          <clipPath id={`plumb-agreement-clip-${r.x}-${r.y}`.replace(/[^\w-]/g, "_")}>
            <rect x={L} y={T} width={W - L - R} height={H - T - B} />
          </clipPath>
        </defs>
        <Axes f={f} xLabel={`${r.x}${u}`} yLabel={`${r.y}${u}`} />
        <g clip-path={`url(#${`plumb-agreement-clip-${r.x}-${r.y}`.replace(/[^\w-]/g, "_")})`}>
          {lines.map((l) => (
            <line
              key={l.key}
              {...seg(l.a, l.b)}
              stroke={l.color}
              stroke-width={l.key === "deming" ? 2 : 1.25}
              stroke-dasharray={l.dash}
            />
          ))}
        </g>
        {xs.map((x, k) => (
          <circle key={k} cx={f.sx(x)} cy={f.sy(ys[k])} r="3" fill="none" stroke={INK} />
        ))}
        {lines.map((l, k) => (
          <g key={`key-${l.key}`}>
            <line
              x1={L + 10}
              x2={L + 28}
              y1={T + 14 + 16 * k}
              y2={T + 14 + 16 * k}
              stroke={l.color === FAINT_INK ? INK : l.color}
              stroke-width={l.key === "deming" ? 2 : 1.25}
              stroke-dasharray={l.dash}
            />
            <text x={L + 32} y={T + 18 + 16 * k} font-size="11" fill={INK}>{l.label}</text>
          </g>
        ))}
      </svg>
      <figcaption>
        Each sample's readings{r.replicated ? " (means of its replicates)" : ""}, with the line of
        identity and the two regression lines.
      </figcaption>
    </figure>
  );
}

/** The `agreement` kind's page face: its view, for the live page and the record. */
export const agreementPage: PageFace<AgreementResult, VNode> = {
  kind: "agreement",
  view: AgreementView,
};
