/**
 * The part of the fit view for intervals beyond Wald (issue 19): every
 * parameter's and derived quantity's intervals side by side, each column
 * named by its method, with notes for a side that does not close and for
 * methods that disagree; and, folded, each parameter's profile trace (the
 * profile t against the parameter, the level's ±q marked). Plain markup and
 * SVG for the page and the record.
 *
 * ```
 *  Intervals at 95% by method
 *             Wald            Profile          Bootstrap percentile   Bootstrap BCa
 *  Vm         197.2 … 228.2   197.3 … 229.3    200.8 … 227.5          201.1 … 228.0
 *  K          0.0457 … 0.0826 0.0469 … 0.0862  …
 *  efficiency (Vm/K) = 3320, u 350   delta 2530 … 4100   profile 2610 … 4300   ¹
 *  ¹ the methods disagree: …
 *  ▸ Profile traces
 * ```
 *
 * @module
 */
import type { VNode } from "preact";
import type { FitResult } from "./result.ts";
import type { LabelledInterval } from "./_profile.ts";
import {
  formatEstimate,
  formatIntervalAt,
  formatNumber,
  formatUncertainty,
} from "../shared/format.ts";

/** Column headings by method. */
const HEADINGS: Record<LabelledInterval["method"], string> = {
  wald: "Wald",
  profile: "Profile likelihood",
  "bootstrap-percentile": "Bootstrap percentile",
  "bootstrap-bca": "Bootstrap BCa",
};

const ORDER: LabelledInterval["method"][] = [
  "wald",
  "profile",
  "bootstrap-percentile",
  "bootstrap-bca",
];

/** A row of the table: a parameter or a derived quantity. */
interface Row {
  name: string;
  expression: string | null;
  estimate: number | null;
  u: number | null;
  intervals: LabelledInterval[];
  note: string | null;
}

/**
 * The intervals part of a fit's view, or nothing when only Wald intervals exist.
 *
 * @param props The fit's result.
 * @returns The part.
 */
export function IntervalsSection({ r }: { r: FitResult }): VNode | null {
  const rows: Row[] = [
    ...r.parameters.map((p) => ({
      name: p.name,
      expression: null,
      estimate: p.estimate,
      u: p.std_error,
      intervals: p.intervals ?? [],
      note: null,
    })),
    ...(r.derived ?? []).map((d) => ({
      name: d.name,
      expression: d.expression,
      estimate: d.estimate,
      u: d.std_error,
      intervals: d.intervals,
      note: d.note ?? null,
    })),
  ];
  const methods = ORDER.filter((m) =>
    rows.some((row) => row.intervals.some((i) => i.method === m))
  );
  if (methods.length <= 1 && (r.derived ?? []).length === 0) return null;
  const notes: string[] = [];
  const mark = (text: string) => {
    const k = notes.indexOf(text);
    if (k >= 0) return k + 1;
    notes.push(text);
    return notes.length;
  };
  const level = `${formatNumber(100 * r.confidence, 4)}%`;
  const boot = r.intervals?.bootstrap;
  return (
    <div class="plumb-fit-intervals">
      <div class="plumb-fit-interval-scroll">
        <table class="plumb-fit-interval-table">
          <caption>
            Intervals at {level} by method
            {boot && (
              <span class="plumb-fit-interval-basis">
                — bootstrap: {boot.resamples} {boot.resample === "cases" ? "case" : "residual"}{" "}
                resamples, seed {boot.seed}
                {boot.failed > 0 ? `, ${boot.failed} refits left out` : ""}
              </span>
            )}
          </caption>
          <thead>
            <tr>
              <th scope="col">Quantity</th>
              {methods.map((m) => (
                <th scope="col" key={m}>
                  {m === "wald" && (r.derived ?? []).length > 0
                    ? "Wald (delta method)"
                    : HEADINGS[m]}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {rows.map((row) => (
              <tr key={row.name}>
                <th scope="row">
                  <code>{row.name}</code>
                  {row.expression !== null && (
                    <span class="plumb-fit-derived">
                      = <code>{row.expression}</code> = {formatEstimate(row.estimate, row.u)}
                      {row.u !== null && <>, u {formatUncertainty(row.u)}</>}
                    </span>
                  )}
                  {row.note !== null && <sup>{mark(row.note)}</sup>}
                </th>
                {methods.map((m) => {
                  const iv = row.intervals.find((i) => i.method === m);
                  return (
                    <td key={m}>
                      {iv === undefined ? "—" : limits(iv, row)}
                      {iv?.note && <sup>{mark(iv.note)}</sup>}
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {boot && <MonteCarlo rows={rows} />}
      {notes.length > 0 && (
        <ol class="plumb-fit-interval-notes">
          {notes.map((n) => <li key={n}>{n}</li>)}
        </ol>
      )}
      {r.intervals?.profile_traces && <Traces r={r} />}
    </div>
  );
}

/** `lo … hi` at the row's digits; "open" for a side with no limit; a bootstrap limit's MC error as a hover. */
function limits(iv: LabelledInterval, row: Row): VNode {
  const u = row.u ?? NaN;
  const est = row.estimate ?? NaN;
  const end = (v: number | null) =>
    v === null ? "open" : formatIntervalAt([v, v], u, est, { open: "", sep: "|", close: "" })
      .split("|")[0];
  const mc = iv.mc_error;
  const title = mc
    ? `Monte Carlo standard error of the limits: ${formatNumber(mc.lower, 2)} and ${
      formatNumber(mc.upper, 2)
    }`
    : undefined;
  return <span title={title}>{end(iv.lower)} … {end(iv.upper)}</span>;
}

/** One line: the largest Monte Carlo standard error of each quantity's bootstrap limits. */
function MonteCarlo({ rows }: { rows: Row[] }): VNode | null {
  const parts = rows.flatMap((row) => {
    let worst = -Infinity;
    for (const iv of row.intervals) {
      for (const v of [iv.mc_error?.lower, iv.mc_error?.upper]) {
        if (typeof v === "number" && v > worst) worst = v;
      }
    }
    return worst > -Infinity ? [`${row.name} ${formatNumber(worst, 2)}`] : [];
  });
  if (parts.length === 0) return null;
  return (
    <p class="plumb-fit-interval-mc">
      Monte Carlo standard error of the bootstrap limits, at most: {parts.join(", ")}
    </p>
  );
}

/** Folded: one small plot of the profile t per parameter, ±q marked. */
function Traces({ r }: { r: FitResult }): VNode {
  const traces = r.intervals!.profile_traces!.filter((t) => t.at.length > 1);
  return (
    <details class="plumb-fit-traces">
      <summary>Profile traces</summary>
      <p class="plumb-fit-traces-key">
        The profile t of each parameter (the others refitted at each value); the interval is where
        it lies between the dashed lines at ±q. A straight line means the Wald interval is exact.
      </p>
      <div class="plumb-fit-trace-grid">
        {traces.map((t) => {
          const p = r.parameters.find((x) => x.name === t.parameter);
          const w = p?.intervals?.find((i) => i.method === "wald");
          const q = p && w && w.upper !== null && p.std_error
            ? (w.upper - p.estimate) / p.std_error
            : NaN;
          return <TracePlot key={t.parameter} name={t.parameter} at={t.at} tau={t.tau} q={q} />;
        })}
      </div>
    </details>
  );
}

const W = 220, H = 150, PAD = 26;

/** One trace as SVG: τ against the parameter, the level's ±q dashed. */
function TracePlot(props: { name: string; at: number[]; tau: number[]; q: number }): VNode {
  const { at, tau, q } = props;
  const x0 = Math.min(...at), x1 = Math.max(...at);
  const top = Math.max(q || 0, ...tau.map(Math.abs)) * 1.1 || 1;
  const sx = (v: number) => PAD + ((v - x0) / (x1 - x0 || 1)) * (W - PAD - 6);
  const sy = (v: number) => H / 2 - (v / top) * (H / 2 - 12);
  const path = at.map((v, i) =>
    `${i === 0 ? "M" : "L"}${sx(v).toFixed(1)},${sy(tau[i]).toFixed(1)}`
  )
    .join("");
  return (
    <figure class="plumb-fit-trace">
      <svg viewBox={`0 0 ${W} ${H}`} role="img" aria-label={`Profile t of ${props.name}`}>
        <line class="plumb-trace-axis" x1={PAD} x2={W - 6} y1={sy(0)} y2={sy(0)} />
        {Number.isFinite(q) &&
          [q, -q].map((v) => (
            <line key={v} class="plumb-trace-level" x1={PAD} x2={W - 6} y1={sy(v)} y2={sy(v)} />
          ))}
        <path class="plumb-trace-line" d={path} />
        {at.map((v, i) => (
          <circle key={i} class="plumb-trace-point" cx={sx(v)} cy={sy(tau[i])} r="2" />
        ))}
        <text x={PAD} y={H - 4} class="plumb-trace-tick">{formatNumber(x0, 4)}</text>
        <text x={W - 6} y={H - 4} class="plumb-trace-tick" text-anchor="end">
          {formatNumber(x1, 4)}
        </text>
      </svg>
      <figcaption>
        <code>{props.name}</code>
      </figcaption>
    </figure>
  );
}
