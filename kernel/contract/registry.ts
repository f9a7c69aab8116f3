/**
 * The registry of cell kinds: the one hook through which kinds enter the kernel.
 *
 * The kernel never imports a kind directly; it receives a registry (the
 * product's is `cells/mod.ts`, tests build their own).
 *
 * @module
 */
import type { CellKind } from "./kind.ts";

/** A kind record of any spec, output and result type (the registry is heterogeneous). */
// deno-lint-ignore no-explicit-any
export type AnyKind = CellKind<any, any, any>;

/** Kinds by name. */
export type Registry = ReadonlyMap<string, AnyKind>;

/**
 * Builds a registry from kind records, refusing duplicate kind names.
 *
 * @param kinds The kind records.
 * @returns A registry keyed by `kind.kind`.
 * @throws {Error} When two records share a kind name.
 * @example
 * ```ts
 * import { makeRegistry } from "./registry.ts";
 * const r = makeRegistry([]);
 * if (r.size !== 0) throw new Error();
 * ```
 */
export function makeRegistry(kinds: readonly AnyKind[]): Registry {
  const map = new Map<string, AnyKind>();
  for (const k of kinds) {
    if (map.has(k.kind)) throw new Error(`Duplicate cell kind "${k.kind}"`);
    map.set(k.kind, k);
  }
  return map;
}
