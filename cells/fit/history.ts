/**
 * The fit's face in the run history: its estimates with their intervals and
 * criteria, and what changed between two records: each parameter's shift
 * (absolute, relative, in its earlier interval or not, and whether the two
 * estimates differ significantly given both uncertainties), the model, the
 * rows used, σ, convergence.
 *
 * The difference test is the normal test of two independent estimates,
 * z = (b₂ − b₁)/√(se₁² + se₂²), two-sided at the newer record's level
 * (common practice, no source: the standard normal test of a difference of
 * two independent estimates). Two runs that share rows give positively
 * correlated estimates, so the true variance of the difference is smaller
 * than se₁² + se₂² and the test is conservative: it calls fewer changes
 * significant than a test knowing the correlation would.
 *
 * A field an older record lacks leaves its comparison out (a missing
 * standard error: no test; a missing interval: no verdict on it), never
 * read as zero.
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
  /** The level of the parameters' intervals. */
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

/** The test named in every parameter comparison's numbers. */
export const DIFFERENCE_TEST = "normal test of two independent estimates, z = Δ/√(se₁² + se₂²), " +
  "two-sided; conservative when the runs share rows (their estimates are then positively " +
  "correlated, so the difference varies less than this assumes)";

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
const level = (x: unknown): x is number => num(x) && x > 0 && x < 1;

/** An interval with both limits known, else null. */
function interval(ci: unknown): [number, number] | null {
  return Array.isArray(ci) && num(ci[0]) && num(ci[1]) ? [ci[0], ci[1]] : null;
}

/** The parameters a record keeps that carry a name and an estimate. */
function parametersOf(k: FitKept): ParameterKept[] {
  return k.parameters.filter((q) =>
    typeof q === "object" && q !== null && typeof q.name === "string" && num(q.estimate)
  );
}

/** An estimate with its interval, rounded to its uncertainty: `9.882 [9.828, 9.936]`. */
function shown(q: ParameterKept): string {
  const u = num(q.std_error) ? q.std_error : null;
  const ci = interval(q.ci);
  return `${formatEstimate(q.estimate, u)}${ci ? ` ${formatIntervalAt(ci, u, q.estimate)}` : ""}`;
}

/** The numbers of one parameter's comparison (a change's `numbers`). */
export interface ParameterShift {
  name: string;
  before: number;
  after: number;
  before_ci: [number, number] | null;
  after_ci: [number, number] | null;
  change: number;
  /** change / |before|; null when before is 0. */
  relative: number | null;
  /** Whether `after` lies outside `before_ci`; null without an earlier interval. */
  outside_previous_interval: boolean | null;
  /** Δ/√(se₁² + se₂²); null without both standard errors. */
  z: number | null;
  p_value: number | null;
  /** p < 1 − level; null without a test. */
  significant: boolean | null;
  /** The level the test was judged at. */
  level: number;
  test: string;
  unit: string | null;
}

/**
 * One parameter's comparison between two records.
 *
 * @param a The earlier record's parameter.
 * @param b The newer record's.
 * @param at The level to judge the difference at.
 * @returns The numbers behind its sentence.
 */
export function compareParameter(a: ParameterKept, b: ParameterKept, at: number): ParameterShift {
  const delta = b.estimate - a.estimate;
  const before = interval(a.ci);
  const se = num(a.std_error) && num(b.std_error) ? Math.hypot(a.std_error, b.std_error) : null;
  const z = se !== null && se > 0 ? delta / se : null;
  const p = z === null ? null : 2 * standardNormal.upper(Math.abs(z));
  return {
    name: b.name,
    before: a.estimate,
    after: b.estimate,
    before_ci: before,
    after_ci: interval(b.ci),
    change: delta,
    relative: a.estimate !== 0 ? delta / Math.abs(a.estimate) : null,
    outside_previous_interval: before === null
      ? null
      : b.estimate < before[0] || b.estimate > before[1],
    z,
    p_value: p,
    significant: p === null ? null : p < 1 - at,
    level: at,
    test: DIFFERENCE_TEST,
    unit: b.unit ?? null,
  };
}

const percent = (x: number) => `${formatNumber(x * 100, 3)}%`;

/** "with 40 new rows" from the rows of the tables the fit reads; "" without. */
function rowsPhrase(ctx: ChangeContext): string {
  const r = ctx.rows;
  if (!r) return "";
  const rows = (n: number) => (n === 1 ? "row" : "rows");
  const parts = [
    ...(r.added ? [`${r.added} new ${rows(r.added)}`] : []),
    ...(r.removed ? [`${r.removed} ${rows(r.removed)} gone`] : []),
    ...(r.changed ? [`${r.changed} ${rows(r.changed)} changed`] : []),
  ];
  return parts.length ? ` with ${parts.join(", ")}` : "";
}

/** Why a parameter's move is notable, in words. */
function why(c: ParameterShift, previousLevel: number | null): string {
  const test = c.z !== null && c.p_value !== null
    ? `z = ${formatNumber(c.z, 2)}, p = ${formatP(c.p_value)}`
    : null;
  const where = previousLevel !== null
    ? `its previous ${percent(previousLevel)} interval`
    : "its previous interval";
  if (c.outside_previous_interval && c.significant) return `outside ${where} (${test})`;
  if (c.outside_previous_interval) {
    return `outside ${where}${test ? `, though not a significant change (${test})` : ""}`;
  }
  return `a significant change (${test}), though inside ${where}`;
}

function parameterChanges(cell: string, a: FitKept, b: FitKept, at: number): Change[] {
  const before = new Map(parametersOf(a).map((q) => [q.name, q]));
  const previousLevel = level(a.level) ? a.level : null;
  const out: Change[] = [];
  const steady: ParameterShift[] = [];
  for (const q of parametersOf(b)) {
    const was = before.get(q.name);
    if (!was) continue;
    const c = compareParameter(was, q, at);
    if (c.outside_previous_interval === null && c.significant === null) {
      if (c.change !== 0) out.push(unjudged(cell, was, q, c));
    } else if (c.outside_previous_interval || c.significant) {
      out.push({
        code: "parameter-moved",
        weight: "notable",
        sentence: `${cell}: ${q.name} moved from ${shown(was)} to ${shown(q)}${
          q.unit ? ` ${q.unit}` : ""
        }, ${why(c, previousLevel)}.`,
        numbers: { ...c },
      });
    } else steady.push(c);
  }
  if (steady.some((c) => c.change !== 0)) {
    const tested = steady.filter((c) => c.z !== null);
    const most = tested.length
      ? tested.reduce((m, c) => (Math.abs(c.z!) > Math.abs(m.z!) ? c : m))
      : null;
    const names = steady.map((c) => c.name);
    const list = names.length === 1
      ? names[0]
      : `${names.slice(0, -1).join(", ")} and ${names[names.length - 1]}`;
    const within = steady.every((c) => c.outside_previous_interval === false);
    const where = previousLevel !== null ? `previous ${percent(previousLevel)}` : "previous";
    const said = within
      ? `stayed within ${names.length === 1 ? "its" : "their"} ${where} ${
        names.length === 1 ? "interval" : "intervals"
      }`
      : "did not change significantly";
    out.push({
      code: "parameters-steady",
      weight: "minor",
      sentence: `${cell}: ${list} ${said}${
        most
          ? ` (largest shift: ${most.name}, ${formatNumber(Math.abs(most.z!), 2)} standard ` +
            `errors of the difference)`
          : ""
      }.`,
      numbers: { parameters: steady, largest: most?.name ?? null },
    });
  }
  return out;
}

/** A shift that neither an interval nor standard errors let us judge (an older record). */
function unjudged(cell: string, was: ParameterKept, q: ParameterKept, c: ParameterShift): Change {
  return {
    code: "parameter-not-judged",
    weight: "minor",
    sentence: `${cell}: ${q.name} moved from ${shown(was)} to ${shown(q)}${
      q.unit ? ` ${q.unit}` : ""
    }; without an earlier interval or both standard errors the move is not judged.`,
    numbers: { ...c },
  };
}

function names(k: FitKept): string[] {
  return k.parameters.filter((q) => typeof q?.name === "string").map((q) => q.name);
}

function changes(a: FitKept, b: FitKept, ctx: ChangeContext): Change[] {
  const cell = ctx.cell;
  if (!Array.isArray(a?.parameters) || !Array.isArray(b?.parameters)) return [];
  const out: Change[] = [];
  if (typeof a.model === "string" && typeof b.model === "string" && a.model !== b.model) {
    return [{
      code: "model-changed",
      weight: "notable",
      sentence:
        `${cell}: the model is now ${b.model} (was ${a.model}); its estimates are not compared.`,
      numbers: { before: a.model, after: b.model },
    }];
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
      sentence: `${cell}: the fit converges again${rowsPhrase(ctx)}.`,
      numbers: {},
    });
  }
  out.push(...parameterChanges(cell, a, b, level(b.level) ? b.level : ctx.level));
  const namesA = new Set(names(a)), namesB = new Set(names(b));
  const added = [...namesB].filter((n) => !namesA.has(n));
  const gone = [...namesA].filter((n) => !namesB.has(n));
  if (added.length + gone.length > 0) {
    const parts = [
      ...(added.length ? [`added: ${added.join(", ")}`] : []),
      ...(gone.length ? [`removed: ${gone.join(", ")}`] : []),
    ];
    out.push({
      code: "parameters-changed",
      weight: "notable",
      sentence: `${cell}: parameters ${parts.join("; ")}.`,
      numbers: { added, removed: gone },
    });
  }
  if (num(a.n) && num(b.n) && a.n !== b.n) {
    out.push({
      code: "rows-used-changed",
      weight: "minor",
      sentence: `${cell}: fitted to ${b.n} rows (was ${a.n})${rowsPhrase(ctx)}.`,
      numbers: { before: a.n, after: b.n, rows: ctx.rows },
    });
  }
  out.push(...sigmaChange(cell, a, b));
  return out;
}

function sigmaChange(cell: string, a: FitKept, b: FitKept): Change[] {
  if (!num(a.sigma) || !num(b.sigma) || a.sigma === 0) return [];
  const rel = (b.sigma - a.sigma) / a.sigma;
  // Below a millionth, a change of σ is rounding, not news (common practice, no source).
  if (Math.abs(rel) < 1e-6) return [];
  const unit = typeof b.sigma_unit === "string" && b.sigma_unit ? ` ${b.sigma_unit}` : "";
  return [{
    code: "sigma-changed",
    weight: Math.abs(rel) > 0.5 ? "notable" : "minor",
    sentence: `${cell}: the residual standard error is ${formatNumber(b.sigma, 3)}${unit} (was ${
      formatNumber(a.sigma, 3)
    }, ${rel > 0 ? "+" : "−"}${formatNumber(Math.abs(rel) * 100, 2)}%).`,
    numbers: { before: a.sigma, after: b.sigma, relative: rel },
  }];
}

function trend(k: FitKept): TrendSample[] {
  if (!Array.isArray(k?.parameters)) return [];
  return parametersOf(k).map((q) => {
    const ci = interval(q.ci);
    return {
      series: q.name,
      unit: typeof q.unit === "string" ? q.unit : null,
      value: q.estimate,
      lower: ci ? ci[0] : null,
      upper: ci ? ci[1] : null,
      n: num(k.n) ? k.n : null,
    };
  });
}

/** The fit's history face. */
export const fitHistory: HistoryFace<FitSpec, Fit, FitResult, FitKept> = { keep, changes, trend };
