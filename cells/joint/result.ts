/**
 * The RUN-JSON result of a `joint` cell (docs/run-json.md, "joint"): plain
 * JSON, parameters named `k` when shared and `a[group]` per group.
 *
 * @module
 */
import { rowValues } from "../../kernel/arrays.ts";
import type { JointFit } from "./joint.ts";

/** A Wald interval, labelled as the fit kind labels its intervals. */
export interface JointInterval {
  method: "wald";
  level: number;
  lower: number | null;
  upper: number | null;
}

/** One parameter of the joint fit. */
export interface JointParameterResult {
  /** `k` (shared) or `a[group]` (per group). */
  name: string;
  /** The model's parameter. */
  parameter: string;
  /** The group it belongs to (the table's name, or the grouping column's value); null when shared. */
  table: string | null;
  estimate: number;
  std_error: number | null;
  t: number | null;
  p_value: number | null;
  ci: [number, number] | null;
  intervals: JointInterval[];
  unit: string | null;
  at_bound: boolean;
}

/** One sharing test. */
export interface JointSharingResult {
  parameters: string[];
  rss_shared: number;
  rss_separate: number | null;
  df1: number;
  df2: number;
  f: number | null;
  p_value: number | null;
  /** true: one value fits at the level; false: the groups differ; null: no test. */
  shareable: boolean | null;
  /** Each group's own estimate of each tested parameter in the larger fit. */
  separate: { parameter: string; estimates: { table: string; estimate: number }[] }[];
  verdict: string;
}

/** The `joint` result. */
export interface JointResult {
  model: string;
  response: string;
  grouped_by: string | null;
  groups: { name: string; table: string; n: number; rss: number }[];
  shared: string[];
  per_group: string[];
  n: number;
  p: number;
  df_residual: number;
  parameters: JointParameterResult[];
  covariance: (number | null)[][];
  correlation: (number | null)[][];
  rss: number;
  sigma: number | null;
  sigma_unit: string | null;
  log_likelihood: number | null;
  k: number;
  k_convention: string;
  aic: number | null;
  aicc: number | null;
  bic: number | null;
  confidence: number;
  converged: boolean;
  iterations: number;
  sharing: JointSharingResult[];
  /** One sentence over the sharing tests. */
  verdict: string;
  fitted?: number[];
  residuals?: number[];
  rows?: number[];
  /** The group (index into `groups`) of each used row. */
  row_groups?: number[];
}

const num = (x: number) => (Number.isFinite(x) ? x : null);

/** A P×P column-major matrix as rows, NaN as null. */
function square(a: Float64Array, p: number): (number | null)[][] {
  return Array.from(
    { length: p },
    (_, i) => Array.from({ length: p }, (_, j) => num(a[i + j * p])),
  );
}

/**
 * The RUN-JSON result.
 *
 * @param out The joint fit.
 * @param leaveOut Per-row fields not to build (the page copy's).
 * @returns The result.
 */
export function summarizeJoint(out: JointFit, leaveOut?: ReadonlySet<string>): JointResult {
  const st = out.statistics, { layout } = out, P = layout.names.length;
  const params = out.model.parameters;
  const rowGroups = () => {
    const g = new Int32Array(out.rows.length);
    out.offsets.slice(0, -1).forEach((o, k) => g.fill(k, o, out.offsets[k + 1]));
    return rowValues(g);
  };
  return {
    model: out.model.text,
    response: out.responseText,
    grouped_by: out.groupedBy,
    groups: out.groups.map((g) => ({ name: g.label, table: g.table, n: g.n, rss: g.rss })),
    shared: out.shared,
    per_group: params.filter((p) => !out.shared.includes(p)),
    n: st.n,
    p: P,
    df_residual: st.dfResidual,
    parameters: layout.names.map((name, j) => {
      const g = layout.group[j];
      const ci = st.intervals[j];
      return {
        name,
        parameter: params[layout.parameter[j]],
        table: g === null ? null : out.groups[g].label,
        estimate: out.estimates[j],
        std_error: st.stdErrors[j],
        t: st.t[j],
        p_value: st.pValues[j],
        ci,
        intervals: [{
          method: "wald" as const,
          level: st.confidence,
          lower: ci?.[0] ?? null,
          upper: ci?.[1] ?? null,
        }],
        unit: out.units.parameters[layout.parameter[j]],
        at_bound: out.atBound[j],
      };
    }),
    covariance: square(st.covariance, P),
    correlation: square(st.correlation, P),
    rss: st.rss,
    sigma: st.sigma,
    sigma_unit: out.units.response,
    log_likelihood: st.logLikelihood,
    k: st.k,
    k_convention: st.kConvention,
    aic: st.aic,
    aicc: st.aicc,
    bic: st.bic,
    confidence: st.confidence,
    converged: true,
    iterations: out.iterations,
    sharing: out.sharing.map((s) => ({
      parameters: s.parameters,
      rss_shared: s.rssShared,
      rss_separate: s.rssSeparate,
      df1: s.df1,
      df2: s.df2,
      f: s.f,
      p_value: s.pValue,
      shareable: s.shareable,
      separate: s.separate.map((x) => ({
        parameter: x.parameter,
        estimates: x.estimates.map((e) => ({ table: e.group, estimate: e.estimate })),
      })),
      verdict: s.verdict,
    })),
    verdict: overallVerdict(out),
    ...(leaveOut?.has("fitted") ? {} : { fitted: rowValues(out.fitted) }),
    ...(leaveOut?.has("residuals") ? {} : { residuals: rowValues(out.residuals) }),
    ...(leaveOut?.has("rows") ? {} : { rows: rowValues(out.rows) }),
    ...(leaveOut?.has("row_groups") ? {} : { row_groups: rowGroups() }),
  };
}

/** One sentence over the tests: which shared parameters hold, which are rejected. */
function overallVerdict(out: JointFit): string {
  const level = `${Math.round(out.statistics.confidence * 1000) / 10}% level`;
  if (out.shared.length === 0) return "No parameter is shared: nothing to test";
  const single = out.sharing.filter((s) => s.parameters.length === 1);
  const name = (s: { parameters: string[] }) => `"${s.parameters[0]}"`;
  const held = single.filter((s) => s.shareable === true).map(name);
  const rejected = single.filter((s) => s.shareable === false).map(name);
  const untested = single.filter((s) => s.shareable === null).map(name);
  const parts: string[] = [];
  if (held.length > 0) parts.push(`one ${held.join(", ")} fits every group`);
  if (rejected.length > 0) parts.push(`the groups differ in ${rejected.join(", ")}`);
  if (untested.length > 0) parts.push(`no test of ${untested.join(", ")}`);
  const all = out.sharing.find((s) => s.parameters.length > 1);
  const together = all === undefined || all.shareable === null
    ? ""
    : all.shareable
    ? "; sharing them all together holds too"
    : "; sharing them all together is rejected";
  return `At the ${level}, ${parts.join("; ")}${together}`;
}
