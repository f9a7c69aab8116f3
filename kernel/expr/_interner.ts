/**
 * Short names for structural keys. A subtree's key used to spell out the
 * whole subtree (`((x/x)/x)…`), so keys of a tree n levels deep cost n² and
 * a derivative's tree (which repeats its inner terms) made compile and
 * compileDD super-linear: `x / x / … / x` of 401 terms, derivative compiled
 * in 4.7 s and 21.5 s. A key made of its children's short names instead
 * stays a few characters long, and equal subtrees still get equal names.
 *
 * @module
 */

/**
 * A function giving each distinct key text a short name (`#0`, `#1`, …).
 *
 * @returns The interner; equal texts give equal names.
 * @example
 * ```ts
 * import { makeInterner } from "./_interner.ts";
 * const name = makeInterner();
 * if (name("(a+b)") !== name("(a+b)") || name("(a+b)") === name("(b+a)")) throw new Error();
 * ```
 */
export function makeInterner(): (text: string) => string {
  const names = new Map<string, string>();
  return (text) => {
    let name = names.get(text);
    if (name === undefined) {
      name = `#${names.size}`;
      names.set(text, name);
    }
    return name;
  };
}
