/**
 * Shrinking a failing input: cut pieces of its main text (halves, then
 * quarters, … down to single characters, as in delta debugging) while the
 * same defect (same kind, error name and project file) still occurs, within
 * a budget of attempts and time.
 *
 * @module
 */
import { type Defect, signature } from "./_oracle.ts";
import type { Target } from "./targets/_target.ts";

/** Runs one check and returns its defect, or null when it passes. */
export type Probe = (input: unknown) => Promise<Defect | null>;

/**
 * The smallest input found that fails the same way.
 *
 * @param target The target.
 * @param input The failing input.
 * @param defect Its defect.
 * @param probe Checks one input (with the time limit).
 * @param budgetMs Time allowed.
 * @returns The shrunk input (the input itself when nothing could be cut).
 */
export async function shrink(
  target: Target,
  input: unknown,
  defect: Defect,
  probe: Probe,
  budgetMs = 3000,
): Promise<unknown> {
  const want = signature(target.name, defect);
  const until = performance.now() + budgetMs;
  let best = input, text = target.text(input);
  for (let chunk = Math.ceil(text.length / 2); chunk >= 1; chunk = Math.floor(chunk / 2)) {
    for (let at = 0; at < text.length && performance.now() < until;) {
      const cut = text.slice(0, at) + text.slice(at + chunk);
      const candidate = target.withText(best, cut);
      const d = await probe(candidate);
      if (d !== null && signature(target.name, d) === want) {
        best = candidate;
        text = cut;
      } else at += chunk;
    }
    if (performance.now() >= until) break;
  }
  return best;
}
