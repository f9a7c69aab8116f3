/**
 * The fit's face in the run history: its estimates with their intervals and
 * criteria, and what changed between two records: each parameter's shift
 * (absolute, relative, in its earlier interval or not, and whether the two
 * estimates differ significantly given both uncertainties), the model, the
 * rows used, σ, convergence.
 *
 * The difference test is the normal test of two independent estimates,
 * z = (b₂ − b₁)/√(se₁² + se₂²), two-sided at the document's level. Two runs
 * that share rows give positively correlated estimates, so the true variance
 * of the difference is smaller than se₁² + se₂² and the test is conservative.
 *
 * @module
 */
import type { Change, ChangeContext, HistoryFace, TrendSample } from "../../kernel/contract/mod.ts";
import { standardNormal } from "../../kernel/stats/mod.ts";
import type { Fit } from "./fit.ts";
import type { FitSpec } from "./spec.ts";
import type { FitResult } from "./result.ts";
import { formatEstimate, formatIntervalAt, formatNumber, formatP } from "../shared/format.ts";

/** What a record keeps of one parameter. */
export interface ParameterKept {
  name: string;
  estimate: number;
  std_error: number | null;
  ci: [number, number] | null;
  unit: string | null;
}

/** What a record keeps of a fit. */
export interface FitKept {
  method: string;
  model: string;
  response: string;
  n: number;
  p: number;
  df_residual: number;
  level: number;
  sigma: number | null;
  sigma_unit: string | null;
  r2: number | null;
  adj_r2: number | null;
  aic: number | null;
  aicc: number | null;
  bic: number | null;
  rss: number;
  converged: boolean;
  parameters: ParameterKept[];
}

function keep(_out: Fit, _spec: FitSpec, r: FitResult): FitKept {
  return {
    method: r.method,
    model: r.model,
    response: r.response,
    n: r.n,
    p: r.p,
    df_residual: r.df_residual,
    level: r.confidence,
    sigma: r.sigma,
    sigma_unit: r.sigma_unit ?? null,
    r2: r.r2,
    adj_r2: r.adj_r2,
    aic: r.aic,
    aicc: r.aicc,
    bic: r.bic,
    rss: r.rss,
    converged: r.converged,
    parameters: r.parameters.map((q) => ({
      name: q.name,
      estimate: q.estimate,
      std_error: q.std_error,
      ci: q.ci,
      unit: q.unit ?? null,
    })),
  };
}

const num = (x: unknown): x is number => typeof x === "number" && Number.isFinite(x);

/** An estimate with its interval, rounded to its uncertainty: `9.882 [9.828, 9.936]`. */
function shown(q: ParameterKept): string {
  const u = num(q.std_error) ? q.std_error : null;
  return `${formatEstimate(q.estimate, u)}${
    q.ci ? ` ${formatIntervalAt(q.ci, u, q.estimate)}` : ""
  }`;
}

/** One parameter's comparison: the numbers, and whether it is notable. */
export function compareParameter(a: ParameterKept, b: ParameterKept, level: number) {
  const delta = b.estimate - a.estimate;
  const relative = a.estimate !== 0 ? delta / Math.abs(a.estimate) : null;
  const outside = a.ci !== null && Array.isArray(a.ci) &&
    (b.estimate < a.ci[0] || b.estimate > a.ci[1]);
  const se = num(a.std_error) && num(b.std_error) ? Math.hypot(a.std_error, b.std_error) : null;
  const z = se !== null && se > 0 ? delta / se : null;
  const p = z === null ? null : 2 * standardNormal.upper(Math.abs(z));
  const significant = p !== null && p < 1 - level;
  return {
    name: b.name,
    before: a.estimate,
    after: b.estimate,
    before_ci: a.ci,
    after_ci: b.ci,
    change: delta,
    relative,
    outside_previous_interval: outside,
    z,
    p_value: p,
    significant,
    test: "normal test of two independent estimates, z = Δ/√(se₁² + se₂²); " +
      "conservative when the runs share rows",
    unit: b.unit,
  };
}

function rowsPhrase(ctx: ChangeContext): string {
  const r = ctx.rows;
  if (!r) return "";
  const parts = [
    ...(r.added ? [`${r.added} new ${r.added === 1 ? "row" : "rows"}`] : []),
    ...(r.removed ? [`${r.removed} ${r.removed === 1 ? "row" : "rows"} gone`] : []),
    ...(r.changed ? [`${r.changed} changed`] : []),
  ];
  return parts.length ? ` with ${parts.join(", ")}` : "";
}

function changes(a: FitKept, b: FitKept, ctx: ChangeContext): Change[] {
  const cell = ctx.cell;
  const out: Change[] = [];
  if (!Array.isArray(a?.parameters) || !Array.isArray(b?.parameters)) return out;
  if (typeof a.model === "string" && typeof b.model === "string" && a.model !== b.model) {
    out.push({
      code: "model-changed",
      weight: "notable",
      sentence:
        `${cell}: the model is now ${b.model} (was ${a.model}); its estimates are not compared.`,
      numbers: { before: a.model, after: b.model },
    });
    return out;
  }
  if (a.converged === true && b.converged === false) {
    out.push({
      code: "convergence-lost",
      weight: "notable",
      sentence: `${cell}: the fit no longer converged${rowsPhrase(ctx)}.`,
      numbers: {},
    });
  } else if (a.converged === false && b.converged === true) {
    out.push({
      code: "convergence-regained",
      weight: "notable",
      sentence: `${cell}: the fit converges again.`,
      numbers: {},
    });
  }
  const before = new Map(a.parameters.map((q) => [q.name, q]));
  const level = num(b.level) ? b.level : ctx.level;
  const steady: ReturnType<typeof compareParameter>[] = [];
  for (const q of b.parameters) {
    const was = before.get(q.name);
    if (!was || !num(was.estimate) || !num(q.estimate)) continue;
    const c = compareParameter(was, q, level);
    if (c.outside_previous_interval || c.significant) {
      const why = [
        ...(c.outside_previous_interval
          ? [`outside its previous ${formatNumber(level * 100, 3)}% interval`]
          : []),
        ...(c.significant && c.z !== null
          ? [`a significant change (z = ${formatNumber(c.z, 3)}, p = ${formatP(c.p_value!)})`]
          : []),
      ];
      out.push({
        code: "parameter-moved",
        weight: "notable",
        sentence: `${cell}: ${q.name} moved from ${shown(was)} to ${shown(q)}${
          q.unit ? ` ${q.unit}` : ""
        }, ${why.join(" and ")}.`,
        numbers: c,
      });
    } else steady.push(c);
  }
  if (steady.length > 0) {
    const by = (c: ReturnType<typeof compareParameter>) => Math.abs(c.z ?? 0);
    const most = steady.reduce((m, c) => (by(c) > by(m) ? c : m));
    const moved = steady.some((c) => c.change !== 0);
    if (moved) {
      out.push({
        code: "parameters-steady",
        weight: "minor",
        sentence: `${cell}: ${steady.map((c) => c.name).join(", ")} stayed within ${
          steady.length === 1 ? "its" : "their"
        } previous intervals${
          most.z !== null ? ` (largest shift: ${most.name}, z = ${formatNumber(most.z, 2)})` : ""
        }.`,
        numbers: { parameters: steady },
      });
    }
  }
  const names = (k: FitKept) => new Set(k.parameters.map((q) => q.name));
  const added = [...names(b)].filter((n) => !names(a).has(n));
  const gone = [...names(a)].filter((n) => !names(b).has(n));
  if (added.length + gone.length > 0) {
    out.push({
      code: "parameters-changed",
      weight: "notable",
      sentence: `${cell}: parameters ${added.length ? `added: ${added.join(", ")}` : ""}${
        added.length && gone.length ? "; " : ""
      }${gone.length ? `removed: ${gone.join(", ")}` : ""}.`,
      numbers: { added, removed: gone },
    });
  }
  if (num(a.n) && num(b.n) && a.n !== b.n) {
    out.push({
      code: "rows-used-changed",
      weight: "minor",
      sentence: `${cell}: fitted to ${b.n} rows (was ${a.n}).`,
      numbers: { before: a.n, after: b.n },
    });
  }
  if (num(a.sigma) && num(b.sigma) && a.sigma !== b.sigma) {
    const rel = (b.sigma - a.sigma) / a.sigma;
    out.push({
      code: "sigma-changed",
      weight: Math.abs(rel) > 0.5 ? "notable" : "minor",
      sentence: `${cell}: the residual standard error is ${formatNumber(b.sigma, 3)}${
        b.sigma_unit ? ` ${b.sigma_unit}` : ""
      } (was ${formatNumber(a.sigma, 3)}, ${rel > 0 ? "+" : ""}${formatNumber(rel * 100, 2)}%).`,
      numbers: { before: a.sigma, after: b.sigma, relative: rel },
    });
  }
  return out;
}

function trend(k: FitKept): TrendSample[] {
  if (!Array.isArray(k?.parameters)) return [];
  return k.parameters.filter((q) => num(q.estimate)).map((q) => ({
    series: q.name,
    unit: q.unit ?? null,
    value: q.estimate,
    lower: q.ci ? q.ci[0] : null,
    upper: q.ci ? q.ci[1] : null,
    n: num(k.n) ? k.n : null,
  }));
}

/** The fit's history face. */
export const fitHistory: HistoryFace<FitSpec, Fit, FitResult, FitKept> = { keep, changes, trend };
