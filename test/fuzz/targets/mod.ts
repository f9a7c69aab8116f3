/**
 * The fuzz targets, by name, in the order a run visits them.
 *
 * @module
 */
import { csvTarget } from "./csv.ts";
import { documentTarget } from "./document.ts";
import { exprTarget } from "./expr.ts";
import { runTarget } from "./run.ts";
import type { Target } from "./_target.ts";
import { yamlTarget } from "./yaml.ts";

export type { Target };

/** Every target. */
export const TARGETS: readonly Target[] = [
  documentTarget as Target,
  yamlTarget as Target,
  csvTarget as Target,
  exprTarget as Target,
  runTarget as Target,
];

/**
 * A target by name.
 *
 * @param name The target's name.
 * @returns The target.
 * @throws {Error} For an unknown name, listing the known ones.
 */
export function targetNamed(name: string): Target {
  const t = TARGETS.find((x) => x.name === name);
  if (!t) throw new Error(`Unknown target "${name}": use ${TARGETS.map((x) => x.name).join(", ")}`);
  return t;
}
