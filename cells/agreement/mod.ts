/**
 * The `agreement` cell kind: two methods that measured the same samples,
 * both with error, compared by Deming regression (known or replicate-estimated
 * error-variance ratio, weighted for proportional errors, jackknife standard
 * errors), Passing–Bablok regression (rank limits, cusum test of linearity)
 * and the agreement of their differences (bias, limits of agreement and
 * their intervals), with a verdict on constant and proportional differences.
 *
 * ```agreement meters
 * on: readings
 * x: lab
 * y: meter
 * ```
 *
 * @example
 * ```ts
 * import { agreementKind } from "./mod.ts";
 * if (agreementKind.kind !== "agreement" || agreementKind.output !== "Agreement") throw new Error();
 * ```
 *
 * @module
 */
import type { CellKind, TemplateContext } from "../../kernel/contract/mod.ts";
import { AGREEMENT_OPTIONS, type AgreementSpec, parseAgreementSpec } from "./spec.ts";
import type { Agreement } from "./agreement.ts";
import { type AgreementResult, summarizeAgreement } from "./result.ts";
import { runAgreement } from "./run.ts";
import { agreementHistory } from "./history.ts";
import { formatEstimated } from "./_format.ts";
import { formatNumber, formatP, withUnit } from "../shared/format.ts";
import { numberColumns } from "../shared/template_cells.ts";

export type { AgreementSpec } from "./spec.ts";
export type { Agreement } from "./agreement.ts";
export type { AgreementResult, AgreementVerdict, Estimated } from "./result.ts";

/** The `agreement` kind record. */
export const agreementKind: CellKind<AgreementSpec, Agreement, AgreementResult> = {
  kind: "agreement",
  body: "yaml",
  output: "Agreement",
  description:
    "compares two methods that measured the same samples: Deming and Passing–Bablok lines, bias and limits of agreement",
  parse: parseAgreementSpec,
  inputs: (spec) => [{ name: spec.on, accepts: ["Table"], path: ["on"] }],
  run: runAgreement,
  summary: (out) => summarizeAgreement(out),
  line: agreementLine,
  details: agreementDetails,
  options: AGREEMENT_OPTIONS,
  history: agreementHistory,
  template: agreementTemplate,
};

function agreementLine(r: AgreementResult): string {
  const differences = r.verdict.constant, proportional = r.verdict.proportional;
  const found = [
    differences.deming || differences.passing_bablok ? "constant difference" : "",
    proportional.deming || proportional.passing_bablok ? "proportional difference" : "",
  ].filter((s) => s !== "");
  return `${r.y} against ${r.x} · ${r.n} samples · slope ${
    formatEstimated(r.deming.slope)
  } (Deming) · bias ${withUnit(formatEstimated(r.agreement.bias), r.agreement.unit)} · ${
    found.length === 0 ? "no constant or proportional difference shown" : found.join(" and ")
  }`;
}

function agreementDetails(r: AgreementResult): string[] {
  const level = `${formatNumber(100 * r.confidence, 4)}%`;
  const ratio = r.variance_ratio;
  const d = r.deming, pb = r.passing_bablok, a = r.agreement;
  const lines = [
    `Deming${d.weighted ? " (weighted, proportional errors)" : ""}, variance ratio ${
      formatNumber(ratio.value, 4)
    } ${
      ratio.source === "replicates"
        ? `from ${ratio.replicated_samples} replicated samples (${ratio.df} df)`
        : "given"
    }: intercept ${formatEstimated(d.intercept)}, slope ${
      formatEstimated(d.slope)
    }, ${level} jackknife t intervals`,
    `Passing–Bablok: intercept ${formatEstimated(pb.intercept)}, slope ${
      formatEstimated(pb.slope)
    }, ${level} rank intervals from ${pb.slopes} pairwise slopes`,
  ];
  if (pb.linearity !== null) {
    const t = pb.linearity;
    lines.push(
      `linearity (cusum): max ${formatNumber(t.statistic, 3)} against ${
        formatNumber(t.critical, 3)
      }, p ${formatP(t.p_value)}: ${t.linear ? "a straight line holds" : "not a straight line"}`,
    );
  }
  lines.push(
    `agreement (${a.differences === "percent" ? "percent differences" : "y − x"}): bias ${
      withUnit(formatEstimated(a.bias), a.unit)
    }; limits holding ${formatNumber(100 * a.share, 4)}% of differences: ${
      formatEstimated(a.lower)
    } and ${formatEstimated(a.upper)}`,
    r.verdict.sentence,
  );
  return lines;
}

/** A new agreement cell: the latest table's last two number columns. */
function agreementTemplate(ctx: TemplateContext): string {
  const tables = ctx.cells.filter((c) => c.output === "Table").reverse();
  for (const t of tables) {
    const cols = numberColumns(t);
    if (cols.length < 2) continue;
    const [x, y] = cols.slice(-2);
    return `on: ${t.name}\nx: ${x}\ny: ${y}\n`;
  }
  return "on: readings\nx: method_a\ny: method_b\n";
}
