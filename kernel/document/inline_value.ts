/**
 * Inline values in prose, `@(cell.field, digits)`: finds the field in the
 * cell's result and formats it, or says in words what is wrong (an unknown
 * cell or field, a field that is a list or a group, a name that could mean
 * two things). Never silent text. The live page, the record and `plumb run`
 * resolve them here, so all three agree.
 *
 * Paths:
 *
 * - `@(root.r2)`: a field of the result; `@(root.result.r2)` says so
 *   explicitly.
 * - `@(root.parameters.q0.estimate)`: a list of named entries (parameters,
 *   a comparison's rows by fit) is indexed by name as well as by `[i]`.
 * - `@(root.q0)`: a name that is no field but a parameter's is that
 *   parameter's estimate. A name that is both (a parameter called `n` and
 *   the fit's row count `n`) is refused with both paths spelled out.
 *
 * `digits` are significant digits (common practice, no source), kept even
 * when they are trailing zeros: `@(root.r2, 4)` of 0.99903 reads 0.9990. A
 * value that is not 1 (or 0) never prints as 1 (or 0): more digits are
 * shown until it does not (0.9999999904 to 6 digits reads 0.99999999).
 *
 * @module
 */
import { didYouMean } from "../suggest.ts";

/** A resolved inline value: text to show, or an error to show in its place. */
export type Resolved = { ok: true; text: string } | { ok: false; error: string };

/**
 * Formats a number with `digits` significant digits; without digits, with
 * up to 6. Very large or small magnitudes use a power of ten.
 *
 * @param x The number.
 * @param digits Significant digits (1–21), or null.
 * @returns The text, with a true minus sign.
 * @example
 * ```ts
 * import { formatValue } from "./inline_value.ts";
 * if (formatValue(0.99903, 4) !== "0.9990") throw new Error(formatValue(0.99903, 4));
 * if (formatValue(2489.71, 3) !== "2490") throw new Error(formatValue(2489.71, 3));
 * if (formatValue(0.9999999904, 6) !== "0.99999999") throw new Error(formatValue(0.9999999904, 6));
 * ```
 */
export function formatValue(x: number, digits: number | null): string {
  if (Number.isNaN(x)) return "not a number";
  if (!Number.isFinite(x)) return x > 0 ? "∞" : "−∞";
  let d = Math.min(21, Math.max(1, digits ?? 6));
  // Rounding must not turn a value that is not ±1 or 0 into one of them.
  while (
    d < 17 && x !== Number(x.toPrecision(d)) && [1, -1, 0].includes(Number(x.toPrecision(d)))
  ) {
    d++;
  }
  return formatDigits(x, d, digits);
}

function formatDigits(x: number, d: number, digits: number | null): string {
  const a = Math.abs(x);
  let text: string;
  if (x === 0) text = digits === null ? "0" : (0).toPrecision(d);
  else if (a >= 1e-4 && a < 1e15) {
    const exp = Math.floor(Math.log10(a));
    text = exp >= d - 1 || digits === null ? String(Number(x.toPrecision(d))) : x.toPrecision(d);
  } else {
    const [m, e] = x.toExponential(d - 1).split("e");
    text = `${m} × 10${superscript(e.replace("+", ""))}`;
  }
  return text.replace(/^-/, "−");
}

const SUPER: Record<string, string> = {
  "-": "⁻",
  "0": "⁰",
  "1": "¹",
  "2": "²",
  "3": "³",
  "4": "⁴",
  "5": "⁵",
  "6": "⁶",
  "7": "⁷",
  "8": "⁸",
  "9": "⁹",
};

function superscript(s: string): string {
  return [...s].map((c) => SUPER[c] ?? c).join("");
}

function describe(cell: string, path: (string | number)[]): string {
  return cell + path.map((p) => typeof p === "number" ? `[${p}]` : `.${p}`).join("");
}

function show(value: unknown, where: string, digits: number | null): Resolved {
  if (typeof value === "number") return { ok: true, text: formatValue(value, digits) };
  if (typeof value === "string") return { ok: true, text: value };
  if (typeof value === "boolean") return { ok: true, text: value ? "yes" : "no" };
  if (value === null) return { ok: true, text: "none" };
  if (isList(value)) {
    return {
      ok: false,
      error: `"${where}" is a list of ${value.length} values: pick one with [i]`,
    };
  }
  const keys = Object.keys(value as object);
  return {
    ok: false,
    error: `"${where}" is a group of fields: pick one of ${keys.slice(0, 6).join(", ")}`,
  };
}

/**
 * Finds a field in a result and formats it.
 *
 * @param result The cell's result (RUN-JSON `result`).
 * @param cell The cell's name (for messages).
 * @param path Fields and list indexes after the name.
 * @param digits Significant digits, or null.
 * @returns The text, or an error in words.
 * @example
 * ```ts
 * import { resolveValue } from "./inline_value.ts";
 * const r = resolveValue({ r2: 0.998 }, "root", ["r3"], 3);
 * if (r.ok || !r.error.includes('did you mean "r2"')) throw new Error(JSON.stringify(r));
 * ```
 */
export function resolveValue(
  result: unknown,
  cell: string,
  path: readonly (string | number)[],
  digits: number | null,
): Resolved {
  if (path.length === 0) {
    if (result !== null && typeof result === "object" && "value" in result) {
      return show((result as { value: unknown }).value, cell, digits);
    }
    const keys = result !== null && typeof result === "object" ? Object.keys(result) : [];
    return {
      ok: false,
      error: `Cell "${cell}" gives no single value: name a field${
        keys.length ? `, e.g. @(${cell}.${keys[0]})` : ""
      }`,
    };
  }
  const explicit = path[0] === "result" && path.length > 1 && !hasField(result, "result");
  const steps = explicit ? path.slice(1) : parameterPath(result, cell, path);
  if (typeof steps === "string") return { ok: false, error: steps };
  return walk(result, cell, steps, explicit ? ["result"] : [], digits);
}

function hasField(value: unknown, name: string): boolean {
  return value !== null && typeof value === "object" && !Array.isArray(value) &&
    Object.hasOwn(value, name);
}

/** The names of a result's parameters (a fit's), or none. */
function parameterNames(result: unknown): string[] {
  const ps = hasField(result, "parameters") ? (result as { parameters: unknown }).parameters : null;
  if (!Array.isArray(ps)) return [];
  return ps.flatMap((p) => typeof p?.name === "string" ? [p.name as string] : []);
}

/**
 * The path to walk: as written, or a parameter's name read as its estimate;
 * a message when the first name is both a field and a parameter.
 */
function parameterPath(
  result: unknown,
  cell: string,
  path: readonly (string | number)[],
): (string | number)[] | string {
  const [first, ...rest] = path;
  if (typeof first !== "string" || !parameterNames(result).includes(first)) return [...path];
  const asParameter = ["parameters", first, ...(rest.length ? rest : ["estimate"])];
  if (!hasField(result, first)) return asParameter;
  const tail = rest.map((p) => typeof p === "number" ? `[${p}]` : `.${p}`).join("");
  return `"${cell}.${first}" could mean the result's field "${first}" (write @(${cell}.result.${first}${tail})) ` +
    `or parameter "${first}" (write @(${cell}.parameters.${first}.${
      rest.length ? tail.slice(1) : "estimate"
    }))`;
}

/** An entry of a list of named entries (`name`, or a comparison row's `fit`), by name. */
function byName(list: unknown[], name: string): unknown {
  return list.find((e) =>
    e !== null && typeof e === "object" &&
    ((e as { name?: unknown }).name === name || (e as { fit?: unknown }).fit === name)
  );
}

function walk(
  result: unknown,
  cell: string,
  path: readonly (string | number)[],
  prefix: (string | number)[],
  digits: number | null,
): Resolved {
  let value = result;
  for (let i = 0; i < path.length; i++) {
    const step = path[i];
    const here = describe(cell, [...prefix, ...path.slice(0, i)]);
    if (typeof step === "number") {
      if (!isList(value)) return { ok: false, error: `"${here}" is not a list` };
      if (step >= value.length) {
        return { ok: false, error: `"${here}" has ${value.length} items: no [${step}]` };
      }
      value = value[step];
    } else if (isList(value)) {
      const list = Array.isArray(value) ? value : []; // numbers have no names
      const found = byName(list, step);
      if (found === undefined) {
        const names = list.flatMap((e) => {
          const n = (e as { name?: unknown; fit?: unknown } | null)?.name ??
            (e as { fit?: unknown } | null)?.fit;
          return typeof n === "string" ? [n] : [];
        });
        return {
          ok: false,
          error: names.length
            ? `"${here}" has no entry named "${step}"${didYouMean(step, names)}`
            : `"${here}" is a list: pick an item with [i]`,
        };
      }
      value = found;
    } else {
      if (value === null || typeof value !== "object") {
        return { ok: false, error: `"${here}" has no field "${step}"` };
      }
      if (!Object.hasOwn(value, step)) {
        return {
          ok: false,
          error: `Unknown field "${step}" in "${here}"${didYouMean(step, Object.keys(value))}`,
        };
      }
      value = (value as Record<string, unknown>)[step];
    }
  }
  return show(value, describe(cell, [...prefix, ...path]), digits);
}

/**
 * Whether a result's value is a list: a plain array, or a typed array (long
 * per-row fields cross from the compute worker as Float64Array:
 * kernel/worker/protocol.ts, `packRows`).
 */
function isList(v: unknown): v is ArrayLike<unknown> {
  return Array.isArray(v) || (ArrayBuffer.isView(v) && !(v instanceof DataView));
}
