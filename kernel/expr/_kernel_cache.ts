/**
 * Generated functions, kept by their source text.
 *
 * Why: a live update recompiles every model of the document (the design
 * columns, the response, the curves of charts). A function made anew with
 * `new Function` starts in V8's interpreter and its 10,000-row loop is
 * compiled again each time (on-stack replacement, on the engine's helper
 * threads); the same source text handed back the function already made
 * runs optimised from the first row. The generated code is a pure function
 * of its arguments (no data is baked in), so one function per text is safe.
 *
 * @module
 */

/** Generated functions kept at most (the oldest is dropped first). */
const LIMIT = 512;

// deno-lint-ignore ban-types
const kept = new Map<string, Function>();

/**
 * `new Function(...args, body)`, or the function already made from the same text.
 *
 * @param args Parameter names.
 * @param body The function body.
 * @returns The function.
 * @example
 * ```ts
 * import { cachedFunction } from "./_kernel_cache.ts";
 * const a = cachedFunction(["x"], "return x + 1;"), b = cachedFunction(["x"], "return x + 1;");
 * if (a !== b || a(1) !== 2) throw new Error("one function per text");
 * ```
 */
// deno-lint-ignore ban-types
export function cachedFunction(args: readonly string[], body: string): Function {
  const key = `${args.join(",")}\n${body}`;
  let f = kept.get(key);
  if (f !== undefined) {
    kept.delete(key); // most recently used goes last
    kept.set(key, f);
    return f;
  }
  f = new Function(...args, body);
  kept.set(key, f);
  if (kept.size > LIMIT) kept.delete(kept.keys().next().value!);
  return f;
}
