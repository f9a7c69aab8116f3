/**
 * Regression fixtures: one JSON file per crash found, under
 * test/fuzz/fixtures/, holding the target, the input (shrunk), what it
 * reproduces and where it was found. Long repetitions are written as a
 * recipe so the file stays small and readable: a text may be
 * `{ "join": ["y = ", ["(", 3000], "x", [")", 3000]] }`, a piece and its
 * count standing for the piece repeated.
 *
 * @module
 */
import { join } from "node:path";

/** A fixture as stored. */
export interface Fixture {
  /** File name without `.json`. */
  name: string;
  target: string;
  /** What the input reproduces: the defect, where it broke, and a word on why. */
  reproduces: string;
  /** Where the fuzzer found it. */
  found: { seed: number; index: number } | null;
  /** The input (texts possibly as recipes; see {@link expand}). */
  input: unknown;
}

/** The fixtures folder. */
export const FIXTURES = new URL("./fixtures/", import.meta.url);

type Piece = string | [string, number];

/**
 * Expands recipes inside an input: `{ join: [...] }` becomes its text.
 *
 * @param v A stored input.
 * @returns The input as the target takes it.
 */
export function expand(v: unknown): unknown {
  if (Array.isArray(v)) return v.map(expand);
  if (v === null || typeof v !== "object") return v;
  const o = v as Record<string, unknown>;
  if (Object.keys(o).length === 1 && Array.isArray(o.join)) {
    return (o.join as Piece[]).map((p) => (typeof p === "string" ? p : p[0].repeat(p[1]))).join("");
  }
  const out: Record<string, unknown> = {};
  for (const [k, x] of Object.entries(o)) {
    Object.defineProperty(out, k, {
      value: expand(x),
      enumerable: true,
      writable: true,
      configurable: true,
    });
  }
  return out;
}

/** The longest run at `i` of a unit of 1–24 characters repeated at least 10 times. */
function runAt(text: string, i: number): [string, number] | null {
  let best: [string, number] | null = null;
  for (let len = 1; len <= 24 && i + len <= text.length; len++) {
    const unit = text.slice(i, i + len);
    let n = 1;
    while (text.startsWith(unit, i + n * len)) n++;
    if (n >= 10 && n * len >= 40 && (!best || n * len > best[0].length * best[1])) best = [unit, n];
  }
  return best;
}

/**
 * Writes long repetitions of a text as a recipe (the text itself when there are none).
 *
 * @param text A text.
 * @returns The text, or `{ join: pieces }`.
 */
export function compress(text: string): string | { join: Piece[] } {
  const pieces: Piece[] = [];
  let plain = "";
  for (let i = 0; i < text.length;) {
    const run = runAt(text, i);
    if (run === null) {
      plain += text[i++];
      continue;
    }
    if (plain) pieces.push(plain);
    plain = "";
    pieces.push(run);
    i += run[0].length * run[1];
  }
  if (plain) pieces.push(plain);
  return pieces.every((p) => typeof p === "string") ? text : { join: pieces };
}

/** Applies {@link compress} to every string of an input. */
export function compressAll(v: unknown): unknown {
  if (typeof v === "string") return compress(v);
  if (Array.isArray(v)) return v.map(compressAll);
  if (v === null || typeof v !== "object") return v;
  return Object.fromEntries(Object.entries(v).map(([k, x]) => [k, compressAll(x)]));
}

/**
 * Every stored fixture, inputs expanded, sorted by name.
 *
 * @returns The fixtures.
 */
export function loadFixtures(): Fixture[] {
  const out: Fixture[] = [];
  for (const e of Deno.readDirSync(FIXTURES)) {
    if (!e.isFile || !e.name.endsWith(".json")) continue;
    const raw = JSON.parse(Deno.readTextFileSync(new URL(e.name, FIXTURES)));
    out.push({ ...raw, name: e.name.slice(0, -5), input: expand(raw.input) });
  }
  return out.sort((a, b) => a.name.localeCompare(b.name));
}

/**
 * Stores a fixture (its input compressed) unless one of that name exists.
 *
 * @param f The fixture.
 * @returns The file's path, or null when it already existed.
 */
export function saveFixture(f: Fixture): string | null {
  const path = join(FIXTURES.pathname, `${f.name}.json`);
  try {
    Deno.statSync(path);
    return null;
  } catch { /* new */ }
  const { name: _n, ...rest } = f;
  Deno.writeTextFileSync(
    path,
    JSON.stringify({ ...rest, input: compressAll(f.input) }, null, 2) + "\n",
  );
  return path;
}
