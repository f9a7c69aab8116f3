/**
 * Text mutations: insert a hostile token, delete, duplicate (a few times or
 * thousands), replace a character, change the line ends, add a BOM, splice
 * in a piece of another text, truncate. Each draws from the input's own
 * generator, so the result depends on the seed and index alone.
 *
 * @module
 */
import type { Rng } from "./_rng.ts";
import { lineEnd, spice } from "./_generators.ts";

/** Texts grow no longer than this (characters), so one input stays bounded. */
export const MAX_TEXT = 250_000;

/** A position: anywhere, or at a line start half the time. */
function position(text: string, rng: Rng): number {
  const at = rng.int(text.length + 1);
  if (rng.chance(0.5)) return at;
  const nl = text.lastIndexOf("\n", at - 1);
  return nl < 0 ? 0 : nl + 1;
}

/** A span [from, to) of up to `max` characters. */
function span(text: string, rng: Rng, max = 80): [number, number] {
  const from = position(text, rng);
  return [from, Math.min(text.length, from + rng.size(max))];
}

type Mutation = (text: string, rng: Rng, others: readonly string[]) => string;

const MUTATIONS: Mutation[] = [
  (t, rng) => {
    const at = position(t, rng);
    return t.slice(0, at) + spice(rng) + t.slice(at);
  },
  (t, rng) => {
    const [a, b] = span(t, rng);
    return t.slice(0, a) + t.slice(b);
  },
  (t, rng) => {
    const [a, b] = span(t, rng);
    const times = rng.chance(0.95) ? rng.between(2, 4) : rng.size(20_000);
    return t.slice(0, b) + t.slice(a, b).repeat(times) + t.slice(b);
  },
  (t, rng) => {
    const at = rng.int(Math.max(1, t.length));
    return t.slice(0, at) + String.fromCharCode(rng.int(0x80)) + t.slice(at + 1);
  },
  (t, rng) => t.replace(/\r\n|\r|\n/g, () => (rng.chance(0.3) ? lineEnd(rng) : "\n")),
  (t, rng) => {
    const at = rng.chance(0.7) ? 0 : position(t, rng);
    return t.slice(0, at) + "\uFEFF" + t.slice(at);
  },
  (t, rng, others) => {
    const other = rng.pick(others);
    const [a, b] = span(t, rng, 400);
    const [c, d] = span(other, rng, 400);
    return t.slice(0, a) + other.slice(c, d) + t.slice(b);
  },
  (t, rng) => t.slice(0, position(t, rng)),
  (t, rng) => {
    const at = rng.int(t.length + 1);
    return t.slice(0, at) + String(rng.int(10)) + t.slice(at);
  },
];

/**
 * Applies one to `rounds` mutations.
 *
 * @param text The starting text.
 * @param rng The input's generator.
 * @param others Texts to splice pieces from.
 * @param rounds The most mutations to apply.
 * @returns The mutated text, at most {@link MAX_TEXT} characters.
 */
export function mutate(text: string, rng: Rng, others: readonly string[], rounds = 4): string {
  let t = text;
  const n = rng.between(1, rounds);
  for (let i = 0; i < n; i++) t = rng.pick(MUTATIONS)(t, rng, others).slice(0, MAX_TEXT);
  return t;
}
