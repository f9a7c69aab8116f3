/**
 * The `joint` cell kind: one model fitted to several tables at once (or to
 * one table's rows split by a column), some parameters shared by every group
 * and the others one per group, with a test of each sharing.
 *
 * ```joint decay
 * tables: [at-20, at-30, at-40]
 * model: signal = a*exp(-k*t) + b
 * shared: [k]
 * ```
 *
 * One least-squares problem over every row (residuals stacked, the Jacobian
 * block-structured from each group's exact derivatives: `_stacked.ts`),
 * solved by the fit kind's Levenberg–Marquardt and polishing
 * (kernel/optim; `_solve.ts`); the covariance over all parameters from the
 * pooled residuals (`_statistics.ts`); for each shared parameter the fit with
 * it per group and the extra-sum-of-squares F test (`_sharing.ts`).
 *
 * @example
 * ```ts
 * import { jointKind } from "./mod.ts";
 * if (jointKind.kind !== "joint" || jointKind.output !== "JointFit") throw new Error("unexpected");
 * ```
 *
 * @module
 */
import type { CellKind, TemplateContext } from "../../kernel/contract/mod.ts";
import { JOINT_OPTIONS, type JointSpec, parseJointSpec } from "./spec.ts";
import type { JointFit } from "./joint.ts";
import { type JointResult, summarizeJoint } from "./result.ts";
import { runJoint } from "./run.ts";
import { jointHistory } from "./history.ts";
import { numberColumns } from "../shared/template_cells.ts";
import {
  formatEstimate,
  formatIntervalAt,
  formatNumber,
  formatUncertainty,
  withUnit,
} from "../shared/format.ts";

export type { JointSpec } from "./spec.ts";
export type { JointFit } from "./joint.ts";
export type { JointParameterResult, JointResult, JointSharingResult } from "./result.ts";

/** The `joint` kind record. */
export const jointKind: CellKind<JointSpec, JointFit, JointResult> = {
  kind: "joint",
  body: "yaml",
  output: "JointFit",
  description: "fits one model to several tables at once, some parameters shared",
  parse: parseJointSpec,
  inputs: (spec) =>
    spec.on === undefined
      ? spec.tables.map((t, i) => ({ name: t, accepts: ["Table"], path: ["tables", i] }))
      : [{ name: spec.on, accepts: ["Table"], path: ["on"] }],
  run: runJoint,
  summary: (out, _spec, leaveOut) => summarizeJoint(out, leaveOut),
  line: (r) =>
    `${r.model} · ${r.groups.length} groups · n ${r.n} · p ${r.p} · σ ${
      withUnit(formatNumber(r.sigma, 3), r.sigma_unit)
    }${r.shared.length > 0 ? ` · ${sharedLine(r)}` : ""}`,
  details: jointDetails,
  options: JOINT_OPTIONS,
  page: { omit: ["fitted", "residuals", "rows", "row_groups"] },
  rows: ["fitted", "residuals", "rows", "row_groups"],
  history: jointHistory,
  template: jointTemplate,
};

/** `k shared (holds), b shared (rejected)` for the one-line summary. */
function sharedLine(r: JointResult): string {
  return r.shared.map((k) => {
    const t = r.sharing.find((s) => s.parameters.length === 1 && s.parameters[0] === k);
    const word = t?.shareable === true ? "holds" : t?.shareable === false ? "rejected" : "untested";
    return `${k} shared (${word})`;
  }).join(", ");
}

/** The estimates, one line each as the fit kind prints them, then each sharing test's verdict. */
function jointDetails(r: JointResult): string[] {
  const level = `${Math.round(r.confidence * 1000) / 10}%`;
  const lines = r.parameters.map((p) => {
    const u = p.std_error, unit = p.unit ? ` ${p.unit}` : "";
    if (u === null) {
      return `${p.name} = ${formatEstimate(p.estimate, null)}${unit} (${
        p.at_bound ? "held at its limit" : "no standard uncertainty"
      })`;
    }
    return `${p.name} = ${formatEstimate(p.estimate, u)}, u ${
      formatUncertainty(u)
    }${unit}, ${level} ${
      formatIntervalAt(p.ci, u, p.estimate, { open: "", sep: " … ", close: "" })
    }`;
  });
  for (const s of r.sharing) lines.push(`sharing: ${s.verdict}`);
  return lines;
}

/**
 * A new joint fit: the latest two tables that share two number columns, a
 * straight line through them with a shared slope.
 */
function jointTemplate(ctx: TemplateContext): string {
  const tables = ctx.cells.filter((c) => c.output === "Table").reverse();
  for (let i = 0; i < tables.length; i++) {
    for (let j = i + 1; j < tables.length; j++) {
      const other = new Set(numberColumns(tables[j]));
      const common = numberColumns(tables[i]).filter((c) => other.has(c));
      if (common.length < 2) continue;
      const [x, y] = common.slice(-2);
      return `tables: [${tables[j].name}, ${
        tables[i].name
      }]\nmodel: ${y} = a + b*${x}\nshared: [b]\n`;
    }
  }
  return "tables: [table1, table2]\nmodel: y = a + b*x\nshared: [b]\n";
}
