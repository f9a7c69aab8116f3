/**
 * Tiny cell kinds for kernel tests: numbers, sums and a file reader. They
 * exercise the contract without any statistics.
 *
 * @module
 */
import type { CellKind, CellOutput } from "../../contract/mod.ts";
import { CellError } from "../../errors.ts";
import { makeRegistry } from "../../contract/mod.ts";
import { HALVES_FROM, readDelimited } from "../../csv/mod.ts";
import { halvesForTests } from "../../csv/_halves.ts";

interface Num extends CellOutput {
  value: number;
}

/** What every fake kind declares besides its own parts: no options, an empty template. */
const plain = { options: {}, template: () => "" };

/** `num x` with `value: 3` gives 3. */
export const numKind: CellKind<{ value: number }, Num, { value: number }> = {
  kind: "num",
  body: "yaml",
  output: "Value",
  description: "a constant",
  parse(ctx) {
    const v = ctx.options.value;
    if (typeof v !== "number") {
      throw new CellError(`"value" of "${ctx.name}" must be a number`, ["value"]);
    }
    return { value: v };
  },
  inputs: () => [],
  run: (spec) => ({ type: "Value", value: spec.value }),
  summary: (out) => ({ value: out.value }),
  line: (r) => String(r.value),
  ...plain,
};

/** `sum s` with `of: [a, b]` adds the values of cells a and b. */
export const sumKind: CellKind<{ of: string[] }, Num, { value: number }> = {
  kind: "sum",
  body: "yaml",
  output: "Value",
  description: "a sum of other cells",
  parse(ctx) {
    const of = ctx.options.of;
    if (!Array.isArray(of)) {
      throw new CellError(`"of" of "${ctx.name}" must be a list of cells`, ["of"]);
    }
    return { of: of.map(String) };
  },
  inputs: (spec) =>
    spec.of.map((name, i) => ({ name, accepts: ["Value"] as const, path: ["of", i] })),
  run(spec, ctx) {
    let total = 0;
    for (const n of spec.of) total += (ctx.inputs[n] as Num).value;
    return { type: "Value", value: total };
  },
  summary: (out) => ({ value: out.value }),
  line: (r) => String(r.value),
  ...plain,
};

/** `bytes b` with `from: data.txt` gives the file's length (as a "Table", to test wrong-kind references). */
export const bytesKind: CellKind<{ from: string }, Num, { value: number }> = {
  kind: "bytes",
  body: "yaml",
  output: "Table",
  description: "a file's length",
  parse: (ctx) => ({ from: String(ctx.options.from) }),
  inputs: () => [],
  files: (spec) => [{ path: spec.from, option: ["from"] }],
  run: (spec, ctx) => ({ type: "Table", value: ctx.files[spec.from].bytes.length }),
  summary: (out) => ({ value: out.value }),
  line: (r) => `${r.value} bytes`,
  ...plain,
};

/** `length l` with `of: raw` gives the value of a `bytes` cell (a reader of a "Table"). */
export const lengthKind: CellKind<{ of: string }, Num, { value: number }> = {
  kind: "length",
  body: "yaml",
  output: "Value",
  description: "the length a bytes cell read",
  parse: (ctx) => ({ of: String(ctx.options.of) }),
  inputs: (spec) => [{ name: spec.of, accepts: ["Table"] as const, path: ["of"] }],
  run: (spec, ctx) => ({ type: "Value", value: (ctx.inputs[spec.of] as Num).value }),
  summary: (out) => ({ value: out.value }),
  line: (r) => String(r.value),
  ...plain,
};

/**
 * `csvrows c` with `from: big.csv` reads a CSV as the table kind would (two
 * halves from 32 MB) and gives the rows read, plus a million times the reads
 * whose second half a helper thread gave (during this run, in this worker).
 * It waits for the helper to begin rather than take its half back, so the
 * count does not depend on how busy the machine is.
 */
export const csvRowsKind: CellKind<{ from: string }, Num, { value: number }> = {
  kind: "csvrows",
  body: "yaml",
  output: "Value",
  description: "a CSV's rows",
  parse: (ctx) => ({ from: String(ctx.options.from) }),
  inputs: () => [],
  files: (spec) => [{ path: spec.from, option: ["from"] }],
  run(spec, ctx) {
    const taken = halvesForTests.taken;
    halvesForTests.waitForHelper = true;
    try {
      const d = readDelimited(ctx.files[spec.from].bytes, {
        name: spec.from,
        halvesFrom: HALVES_FROM,
      });
      return { type: "Value", value: d.rowCount + 1e6 * (halvesForTests.taken - taken) };
    } finally {
      halvesForTests.waitForHelper = false;
    }
  },
  summary: (out) => ({ value: out.value }),
  line: (r) => String(r.value),
  ...plain,
};

/** `peek p` tries to read a file from inside the worker (it must be refused). */
export const peekKind: CellKind<{ path: string }, Num, { value: number }> = {
  kind: "peek",
  body: "yaml",
  output: "Value",
  description: "tries to escape the sandbox",
  parse: (ctx) => ({ path: String(ctx.options.path) }),
  inputs: () => [],
  run(spec) {
    try {
      return { type: "Value", value: Deno.readTextFileSync(spec.path).length };
    } catch (err) {
      throw new CellError(`Refused: ${(err as Error).constructor.name}`);
    }
  },
  summary: (out) => ({ value: out.value }),
  line: (r) => String(r.value),
  ...plain,
};

/** `spin s` with `ms: 200` busy-waits, for superseded-run tests. */
export const spinKind: CellKind<{ ms: number; tag: number }, Num, { value: number }> = {
  kind: "spin",
  body: "yaml",
  output: "Value",
  description: "busy for a while",
  parse: (ctx) => ({ ms: Number(ctx.options.ms), tag: Number(ctx.options.tag ?? 0) }),
  inputs: () => [],
  run(spec) {
    const end = performance.now() + spec.ms;
    while (performance.now() < end) { /* busy on purpose */ }
    return { type: "Value", value: spec.tag };
  },
  summary: (out) => ({ value: out.value }),
  line: (r) => String(r.value),
  ...plain,
};

/** Runs of `tick` that ran to their end in this worker. */
let ticksFinished = 0;

/**
 * `tick t` with `ms: 3000` is busy for that long, reporting progress about
 * every millisecond (as a search does), and gives how many `tick` runs in
 * this worker ran to their end, itself included: a run stopped early does
 * not count.
 */
export const tickKind: CellKind<{ ms: number; tag: number }, Num, { value: number }> = {
  kind: "tick",
  body: "yaml",
  output: "Value",
  description: "busy for a while, reporting progress",
  parse: (ctx) => ({ ms: Number(ctx.options.ms), tag: Number(ctx.options.tag ?? 0) }),
  inputs: () => [],
  run(spec, ctx) {
    const start = performance.now(), end = start + spec.ms;
    let next = start;
    for (let now = start; now < end; now = performance.now()) {
      if (now >= next) {
        ctx.progress((now - start) / spec.ms);
        next = now + 1;
      }
    }
    return { type: "Value", value: ++ticksFinished };
  },
  summary: (out) => ({ value: out.value }),
  line: (r) => String(r.value),
  ...plain,
};

/** The test registry. */
export const fakeRegistry = makeRegistry([
  numKind,
  sumKind,
  bytesKind,
  lengthKind,
  csvRowsKind,
  peekKind,
  spinKind,
  tickKind,
]);
