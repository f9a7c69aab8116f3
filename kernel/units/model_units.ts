/**
 * The units of a model's parameters by dimensional analysis, from the units
 * of its columns.
 *
 * Method: every node of the model's tree gets a unit that is a product of
 * the columns' units and of unknown parameter units raised to fractional
 * powers, written as a base unit times Π U_θ^c_θ. Sums, the two sides of
 * the model, and the arguments of min and max must agree (a number written
 * in a sum is read in the unit of the other term); exp, log, the
 * trigonometric functions and a fitted power take pure numbers (Bridgman,
 * *Dimensional Analysis*, 1922, ch. 1: only quantities of one kind add, and
 * transcendental functions take dimensionless arguments; from memory). Each
 * such requirement is one linear equation Σ c_θ·U_θ = unit in the exponents,
 * the same coefficients for every symbol; the equations are reduced one at
 * a time (Gauss–Jordan elimination over exact fractions), so an equation
 * that contradicts the earlier ones is found at the term that wrote it, and
 * named in a warning. A parameter whose row is left without free unknowns
 * has its unit; any other says why not: a fitted power of a quantity with a
 * unit (`a*x^b`: a is then in y/x^b), a column without a declared unit, or
 * a model that does not fix it.
 *
 * ```
 *   capacity = q0 - a*sqrt(cycle)        capacity: mAh, cycle: cycles
 *   U_q0 = mAh                           (the two sides agree)
 *   U_a·cycles^½ = U_q0                  (the terms of the sum agree)
 *   ⇒ q0: mAh, a: mAh/cycles^0.5
 * ```
 *
 * @module
 */
import type { Expr } from "../expr/mod.ts";
import { CONSTANTS } from "../expr/mod.ts";
import {
  addF,
  divF,
  formatUnit,
  type Fraction,
  isZeroF,
  mulF,
  NO_UNIT,
  parseUnit,
  powerUnit,
  timesUnit,
  toFraction,
  type Unit,
} from "./unit.ts";

/** What the analysis reads of a model. */
export interface ModelForUnits {
  /** The model as written: the offsets of the tree point into it. */
  text: string;
  response: Expr;
  rhs: Expr;
  parameters: readonly string[];
}

/** A parameter's unit, or why it has none. */
export interface ParameterUnit {
  /** The unit as written by `formatUnit`; null for a pure number or when not derivable. */
  unit: string | null;
  /** Why no unit could be derived; null when it was (or the parameter is a pure number). */
  note: string | null;
}

/** The units of a model. */
export interface ModelUnits {
  /** By parameter, in the model's order. */
  parameters: Map<string, ParameterUnit>;
  /** The unit of the response as the model writes it (of σ, fitted values, residuals); null for none. */
  response: string | null;
  /** The unit of each column the model uses, as written in the table (null for none). */
  columns: Map<string, string | null>;
  /** Terms whose units cannot agree, with the offset of the term in `text`. */
  warnings: { message: string; offset: number }[];
}

type Coef = Map<string, Fraction>;
/** base · Π U_θ^coef_θ, or a unit that cannot be written so (with the reason). */
type Form =
  | { known: true; base: Unit; coef: Coef }
  | { known: false; reason: string; params: Set<string> };

const PURE: Form = { known: true, base: NO_UNIT, coef: new Map() };
const PURE_ARGUMENT = new Set(["exp", "log", "log10", "sin", "cos", "tan", "atan", "tanh"]);

/** One reduced equation: U_pivot + Σ coef_θ·U_θ = rhs. */
interface Row {
  pivot: string;
  coef: Coef;
  rhs: Unit;
}

class Analysis {
  rows: Row[] = [];
  reasons = new Map<string, string>();
  warnings: { message: string; offset: number }[] = [];
  constructor(
    readonly text: string,
    readonly columns: ReadonlyMap<string, Unit | null>,
    readonly parameters: ReadonlySet<string>,
  ) {}

  /** The requirements base + Σ coef·U = 0 met while walking the tree, in order. */
  pending: { base: Unit; coef: Coef; at: Expr; what: (left: string) => string }[] = [];

  /** Notes base + Σ coef·U = 0 from a term (solved later by {@link reduce}). */
  require(base: Unit, coef: Coef, at: Expr, what: (left: string) => string) {
    this.pending.push({ base, coef, at, what });
  }

  /** Adds one requirement to the reduced rows; warns when it contradicts the earlier ones. */
  reduce(base: Unit, coef: Coef, at: Expr, what: (left: string) => string) {
    let c = new Map(coef), rhs = powerUnit(base, [-1, 1]);
    for (const r of this.rows) {
      const k = c.get(r.pivot);
      if (k === undefined) continue;
      c = combine(c, r.coef, [-k[0], k[1]]);
      c.delete(r.pivot);
      rhs = timesUnit(rhs, r.rhs, [-k[0], k[1]]);
    }
    if (c.size === 0) {
      if (rhs.size > 0) this.warn(at, what(this.written(powerUnit(rhs, [-1, 1]))));
      return;
    }
    const [pivot, p] = c.entries().next().value!;
    c.delete(pivot);
    const inv: Fraction = divF([1, 1], p);
    const row: Row = { pivot, coef: scale(c, inv), rhs: powerUnit(rhs, inv) };
    for (const r of this.rows) {
      const k = r.coef.get(pivot);
      if (k === undefined) continue;
      r.coef = combine(r.coef, row.coef, [-k[0], k[1]]);
      r.coef.delete(pivot);
      r.rhs = timesUnit(r.rhs, row.rhs, [-k[0], k[1]]);
    }
    this.rows.push(row);
  }

  /** A unit written with its symbols in the order the columns' units first name them. */
  written(u: Unit): string {
    const order = [...this.columns.values()].flatMap((c) => (c === null ? [] : [...c.keys()]));
    const rank = (s: string) => (order.indexOf(s) + order.length + 1) % (order.length + 1);
    return formatUnit(new Map([...u].sort((a, b) => rank(a[0]) - rank(b[0]))));
  }

  warn(at: Expr, message: string) {
    this.warnings.push({ message, offset: at.start });
  }

  shown(e: Expr): string {
    return this.text.slice(e.start, e.end).trim();
  }

  opaque(reason: string, ...forms: Form[]): Form {
    const params = new Set<string>();
    for (const f of forms) {
      for (const p of f.known ? f.coef.keys() : f.params) params.add(p);
      if (!f.known) {
        for (const p of f.params) if (!this.reasons.has(p)) this.reasons.set(p, f.reason);
      }
    }
    for (const p of params) if (!this.reasons.has(p)) this.reasons.set(p, reason);
    return { known: false, reason, params };
  }

  form(e: Expr): Form {
    switch (e.op) {
      case "num":
        return PURE;
      case "id":
        return this.id(e);
      case "neg":
        return this.form(e.arg);
      case "+":
      case "-": {
        // A number written in a sum is read in the unit of what it is added to
        // (`temperature - 15` with temperature in °C; common practice, no source).
        if (constantValue(e.right) !== null) return this.form(e.left);
        if (constantValue(e.left) !== null) return this.form(e.right);
        return this.sum(e, this.form(e.left), this.form(e.right));
      }
      case "*":
      case "/": {
        const a = this.form(e.left), b = this.form(e.right);
        if (!a.known || !b.known) {
          return this.opaque(a.known ? (b as { reason: string }).reason : a.reason, a, b);
        }
        const s: Fraction = e.op === "*" ? [1, 1] : [-1, 1];
        return {
          known: true,
          base: timesUnit(a.base, b.base, s),
          coef: combine(a.coef, b.coef, s),
        };
      }
      case "^":
        return this.power(e, e.left, e.right);
      case "call":
        return this.call(e);
    }
  }

  id(e: Extract<Expr, { op: "id" }>): Form {
    if (this.parameters.has(e.name)) {
      return { known: true, base: NO_UNIT, coef: new Map([[e.name, [1, 1]]]) };
    }
    if (CONSTANTS.has(e.name)) return PURE;
    const u = this.columns.get(e.name);
    if (u === undefined || u === null) return this.opaque(`column "${e.name}" has no unit`);
    return { known: true, base: u, coef: new Map() };
  }

  sum(e: Expr, a: Form, b: Form): Form {
    if (a.known && b.known) {
      this.require(
        timesUnit(a.base, b.base, [-1, 1]),
        combine(a.coef, b.coef, [-1, 1]),
        e,
        (left) =>
          `Units in "${this.shown(e)}" do not agree: its terms differ by ${
            left || "a pure number"
          }`,
      );
      return a;
    }
    return a.known ? a : b.known ? b : this.opaque(a.reason, a, b);
  }

  power(e: Expr, base: Expr, exponent: Expr): Form {
    const b = this.form(base);
    const c = constantValue(exponent);
    if (c !== null) {
      const f = toFraction(c);
      if (b.known && f !== null) {
        return { known: true, base: powerUnit(b.base, f), coef: scale(b.coef, f) };
      }
      if (b.known && b.base.size === 0 && b.coef.size === 0) return PURE;
      return this.opaque(
        `"${this.shown(e)}" raises a quantity to a power that is not a fraction`,
        b,
      );
    }
    const x = this.form(exponent);
    if (x.known) this.pureNumber(x, exponent, "a power");
    if (b.known && b.base.size > 0 && b.coef.size === 0) {
      return this.opaque(
        `"${this.shown(e)}" raises a quantity with a unit to a fitted power`,
        b,
        x,
      );
    }
    if (b.known) this.pureNumber(b, base, "the base of a fitted power");
    return b.known ? PURE : this.opaque(b.reason, b, x);
  }

  pureNumber(f: Extract<Form, { known: true }>, at: Expr, role: string) {
    this.require(
      f.base,
      f.coef,
      at,
      (left) => `"${this.shown(at)}" has the unit ${left}, but ${role} must be a pure number`,
    );
  }

  call(e: Extract<Expr, { op: "call" }>): Form {
    const args = e.args.map((a) => this.form(a));
    if (PURE_ARGUMENT.has(e.fn)) {
      const a = args[0];
      if (a.known) this.pureNumber(a, e.args[0], `the argument of ${e.fn}`);
      return PURE;
    }
    if (e.fn === "sqrt" || e.fn === "abs") {
      const a = args[0];
      if (!a.known || e.fn === "abs") return a;
      return { known: true, base: powerUnit(a.base, [1, 2]), coef: scale(a.coef, [1, 2]) };
    }
    if (e.fn === "pow") return this.power(e, e.args[0], e.args[1]);
    if (e.fn === "min" || e.fn === "max") return this.sum(e, args[0], args[1]);
    return this.opaque(`the unit of ${e.fn}(…) is not known`, ...args);
  }
}

function scale(c: Coef, s: Fraction): Coef {
  return combine(new Map(), c, s);
}

/** a + s·b over the parameters, zero entries left out. */
function combine(a: Coef, b: Coef, s: Fraction): Coef {
  const out = new Map(a);
  for (const [p, k] of b) {
    const v = addF(out.get(p) ?? [0, 1], mulF(k, s));
    if (isZeroF(v)) out.delete(p);
    else out.set(p, v);
  }
  return out;
}

/** The value of a subtree of numbers and named constants, else null. */
function constantValue(e: Expr): number | null {
  switch (e.op) {
    case "num":
      return e.value;
    case "id":
      return CONSTANTS.get(e.name) ?? null;
    case "neg": {
      const v = constantValue(e.arg);
      return v === null ? null : -v;
    }
    case "call":
      return null;
    default: {
      const a = constantValue(e.left), b = constantValue(e.right);
      if (a === null || b === null) return null;
      return e.op === "+"
        ? a + b
        : e.op === "-"
        ? a - b
        : e.op === "*"
        ? a * b
        : e.op === "/"
        ? a / b
        : a ** b;
    }
  }
}

/**
 * The units of a model's parameters and response from its columns' units.
 *
 * @param model The model (text, sides, parameters).
 * @param columnUnits The unit of each column as written (a table's `units`), by name; a
 *   column absent or null has no declared unit.
 * @returns Each parameter's unit or the reason it has none, the response's unit, and
 *   warnings for terms whose units cannot agree. With no unit on any column of the
 *   model, every unit is null and nothing is said.
 * @example
 * ```ts
 * import { parseModel } from "../expr/mod.ts";
 * import { modelUnits } from "./model_units.ts";
 * const m = parseModel("capacity = q0 - a*sqrt(cycle)", ["capacity", "cycle"]);
 * const u = modelUnits(m, new Map([["capacity", "mAh"], ["cycle", "cycles"]]));
 * if (u.parameters.get("a")?.unit !== "mAh/cycles^0.5") throw new Error(JSON.stringify([...u.parameters]));
 * ```
 */
export function modelUnits(
  model: ModelForUnits,
  columnUnits: ReadonlyMap<string, string | null>,
): ModelUnits {
  const parsed = new Map<string, Unit | null>();
  const warnings: ModelUnits["warnings"] = [];
  for (const [name, text] of columnUnits) {
    if (text === null) continue;
    const r = parseUnit(text);
    if ("unit" in r) parsed.set(name, r.unit);
    else warnings.push({ message: `${r.error} (column "${name}")`, offset: 0 });
  }
  const none = new Map(model.parameters.map((p) => [p, { unit: null, note: null }]));
  const columns = new Map(columnUnits);
  if (parsed.size === 0) return { parameters: none, response: null, columns, warnings };
  const a = new Analysis(model.text, parsed, new Set(model.parameters));
  // A logarithmic response is read as the log of the number in its column's unit (common
  // practice: ln(y/1 mAh) written ln y); every other transform goes through the rules.
  const logResponse = model.response.op === "call" &&
    (model.response.fn === "log" || model.response.fn === "log10");
  const left = logResponse ? PURE : a.form(model.response), right = a.form(model.rhs);
  if (left.known && right.known) {
    // The two sides first: a term that disagrees is then blamed at the term, not at the sides.
    a.reduce(
      timesUnit(left.base, right.base, [-1, 1]),
      combine(left.coef, right.coef, [-1, 1]),
      model.rhs,
      (u) =>
        `Units of the two sides of "${model.text}" do not agree: they differ by ${
          u || "a pure number"
        }`,
    );
  }
  for (const r of a.pending) a.reduce(r.base, r.coef, r.at, r.what);
  const parameters = new Map<string, ParameterUnit>();
  for (const p of model.parameters) {
    const row = a.rows.find((r) => r.pivot === p);
    if (row !== undefined && row.coef.size === 0) {
      parameters.set(p, { unit: a.written(row.rhs) || null, note: null });
      continue;
    }
    const reason = a.reasons.get(p) ??
      (row === undefined
        ? "the model does not fix its unit"
        : `its unit depends on that of ${[...row.coef.keys()].map((q) => `"${q}"`).join(", ")}`);
    parameters.set(p, { unit: null, note: reason });
  }
  const response = left.known && left.coef.size === 0 ? a.written(left.base) || null : null;
  return { parameters, response, columns, warnings: [...warnings, ...a.warnings] };
}
