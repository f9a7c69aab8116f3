/**
 * Inline values in prose, `@(cell.field, digits)`: finds the field in the
 * cell's result and formats it, or says in words what is wrong (an unknown
 * cell or field, a field that is a list or a group). Never silent text.
 *
 * `digits` are significant digits (common practice, no source), kept even
 * when they are trailing zeros: `@(root.r2, 4)` of 0.99903 reads 0.9990.
 *
 * @module
 */
import { didYouMean } from "../kernel/suggest.ts";

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
 * ```
 */
export function formatValue(x: number, digits: number | null): string {
  if (Number.isNaN(x)) return "not a number";
  if (!Number.isFinite(x)) return x > 0 ? "∞" : "−∞";
  const d = Math.min(21, Math.max(1, digits ?? 6));
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
  if (Array.isArray(value)) {
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
  let value = result;
  if (path.length === 0) {
    if (value !== null && typeof value === "object" && "value" in value) {
      return show((value as { value: unknown }).value, cell, digits);
    }
    const keys = value !== null && typeof value === "object" ? Object.keys(value) : [];
    return {
      ok: false,
      error: `Cell "${cell}" gives no single value: name a field${
        keys.length ? `, e.g. @(${cell}.${keys[0]})` : ""
      }`,
    };
  }
  for (let i = 0; i < path.length; i++) {
    const step = path[i];
    const here = describe(cell, path.slice(0, i));
    if (typeof step === "number") {
      if (!Array.isArray(value)) return { ok: false, error: `"${here}" is not a list` };
      if (step >= value.length) {
        return { ok: false, error: `"${here}" has ${value.length} items: no [${step}]` };
      }
      value = value[step];
    } else {
      if (value === null || typeof value !== "object" || Array.isArray(value)) {
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
  return show(value, describe(cell, [...path]), digits);
}
