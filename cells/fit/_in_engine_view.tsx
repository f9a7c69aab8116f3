/**
 * The part of the fit view for a fit computed in its database (RUN-JSON
 * `in_engine_detail`, cells/fit/_in_engine.ts): one line saying where the
 * fit was computed, by which route and at what condition number κ; and,
 * folded, why the rows were streamed through QR when they were (the
 * sentence the cell's warnings also carry), which number was computed
 * where, the diagnostics taken from the database's sums and the statements
 * with their times. Plain markup for the page and the record.
 *
 * ```
 *  Computed in DuckDB: the rows stayed in the database. Route: sums (Cholesky of the
 *  centred cross-products), κ = 1.001
 *  ▾ Where each number was computed
 *    Why QR: condition number 1.4e+2: …       (only when the rows were streamed)
 *    In DuckDB                     row counts, column sums, centred cross-products, …
 *    In Plumb, from DuckDB's sums  the estimates, AIC, AICc and BIC
 *    From the database's sums      largest leverage, Breusch–Pagan, Durbin–Watson, Σe
 *    Statements                    1. pass 1: counts and sums, 18 ms  2. …
 * ```
 *
 * @module
 */
import type { VNode } from "preact";
import type { InEngineRecord } from "./_in_engine.ts";
import { formatDuration, formatNumber, formatP } from "../shared/format.ts";

const ENGINES: Record<string, string> = { duckdb: "DuckDB", postgres: "PostgreSQL" };

/** Each step of the computation in words (RUN-JSON's keys of `computed`). */
const STEPS: Record<string, string> = {
  counts: "row counts",
  sums: "column sums",
  cross_products: "centred cross-products",
  solve: "the estimates",
  refinement: "the refinement step",
  rss: "the residual sum of squares",
  residual_sums: "sums of residuals",
  leverage: "the leverage summary",
  breusch_pagan: "Breusch–Pagan's sums",
  durbin_watson: "Durbin–Watson's sums",
  criteria: "AIC, AICc and BIC",
};

/** The engine's name as people write it. */
export function engineName(engine: string): string {
  return ENGINES[engine] ?? engine;
}

/** Where, in words, for one value of `computed`. */
function place(where: string, engine: string): string {
  if (where === "engine") return `In ${engine}`;
  if (where === "plumb") return `In Plumb, from ${engine}'s sums`;
  if (where === "streamed") return "In Plumb, from rows streamed through QR";
  return "Not computed";
}

/** The steps grouped by where they were computed, in the record's order of places. */
function byPlace(d: InEngineRecord, engine: string): { where: string; steps: string[] }[] {
  const groups = new Map<string, string[]>();
  for (const [step, where] of Object.entries(d.computed)) {
    const words = STEPS[step] ?? step.replaceAll("_", " ");
    const key = place(where, engine);
    groups.set(key, [...(groups.get(key) ?? []), words]);
  }
  return [...groups].map(([where, steps]) => ({ where, steps }));
}

function route(d: InEngineRecord): string {
  return d.route === "qr"
    ? "rows streamed through QR in blocks"
    : "sums (Cholesky of the centred cross-products)";
}

/** Diagnostics the database's sums gave, as term and value. */
function diagnostics(d: InEngineRecord): [string, string][] {
  const out: [string, string][] = [];
  const h = d.leverage;
  out.push([
    "Largest leverage",
    `${formatNumber(h.max, 3)} (${h.over2p} rows above 2p/n, ${h.over3p} above 3p/n)`,
  ]);
  const bp = d.breusch_pagan;
  if (bp !== null) {
    const variant = bp.variant === "koenker" ? "Koenker's form" : "original form";
    out.push([
      `Breusch–Pagan, ${variant}`,
      `χ²(${bp.df}) = ${formatNumber(bp.statistic, 4)}, p ${formatP(bp.p_value)}`,
    ]);
  }
  out.push([
    "Durbin–Watson",
    d.durbin_watson === null
      ? "not computed: the table names no order_by (a database table has no row order)"
      : `${formatNumber(d.durbin_watson, 4)} (rows in ${d.order_by}'s order)`,
  ]);
  out.push(["Σ residuals (zero up to rounding)", formatNumber(d.sum_residuals, 3)]);
  if (d.rows_left_out > 0) {
    out.push(["Rows left out (a missing value, or weight 0)", String(d.rows_left_out)]);
  }
  if (d.partition_by !== null) out.push(["Sums taken per partition of", d.partition_by]);
  if (d.weights !== null) out.push(["Relative weights", d.weights]);
  return out;
}

/**
 * Where a fit in a database was computed, for the fit view.
 *
 * @param props The record (`in_engine_detail`).
 * @returns The section.
 * @example
 * ```ts
 * import { renderToString } from "preact-render-to-string";
 * import { InEngineSection } from "./_in_engine_view.tsx";
 * const html = renderToString(InEngineSection({ d: {
 *   engine: "duckdb", route: "sums", kappa: 1.5, rows_left_out: 0, partition_by: null,
 *   order_by: null, weights: null, computed: { counts: "engine", solve: "plumb" }, note: null,
 *   sum_residuals: 0, leverage: { max: 0.01, over2p: 0, over3p: 0, sum: 2 }, durbin_watson: null,
 *   breusch_pagan: null, passes: [{ name: "pass 1: counts and sums", ms: 12 }],
 * } as never }));
 * if (!html.includes("Computed in DuckDB")) throw new Error(html);
 * ```
 */
export function InEngineSection({ d }: { d: InEngineRecord }): VNode {
  const engine = engineName(d.engine);
  return (
    <section class="plumb-fit-engine" aria-label="Computed in the database">
      <p class="plumb-fit-engine-line">
        <strong>Computed in {engine}</strong>: the rows stayed in the database. Route:{" "}
        <span data-route={d.route}>{route(d)}</span>, κ = {formatNumber(d.kappa, 4)}
      </p>
      <details class="plumb-fit-engine-detail">
        <summary>Where each number was computed</summary>
        {d.note !== null && <p class="plumb-fit-engine-note">Why QR: {d.note}</p>}
        <dl class="plumb-fit-engine-where">
          {byPlace(d, engine).map((g) => [
            <dt key={`t-${g.where}`}>{g.where}</dt>,
            <dd key={`d-${g.where}`}>{g.steps.join(", ")}</dd>,
          ])}
        </dl>
        <h5>From the database's sums</h5>
        <dl class="plumb-fit-engine-diagnostics">
          {diagnostics(d).map(([term, value]) => [
            <dt key={`t-${term}`}>{term}</dt>,
            <dd key={`d-${term}`}>{value}</dd>,
          ])}
        </dl>
        <h5>Statements</h5>
        <ol class="plumb-fit-engine-passes">
          {d.passes.map((p, i) => (
            <li key={i}>
              {p.name}, {formatDuration(p.ms)}
            </li>
          ))}
        </ol>
      </details>
    </section>
  );
}
