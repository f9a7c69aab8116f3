/**
 * The cell contract: what every cell kind provides, and the typed values that
 * flow between cells.
 *
 * ```
 *  document ──parse()──▶ spec ──inputs()/files()──▶ graph edges
 *                          │
 *        inputs' outputs ──┴──▶ run() ──▶ output ──summary()──▶ RUN-JSON result
 *                                              └────view()────▶ Preact block
 * ```
 *
 * `parse` runs on the server's main thread (it needs only the options);
 * `run` and `summary` run in the compute worker, which has no permissions:
 * files arrive as bytes in {@link RunContext.files}. Outputs stay in the
 * worker's store; only summaries travel back.
 *
 * Errors are thrown as {@link CellError} with an option path (and an offset
 * into a text value); the kernel turns that into a document line and column.
 *
 * @module
 */
import type { VNode } from "preact";
import type { OptionPath } from "../kernel/errors.ts";

export type { OptionPath };

/** Names of output types. A reference is accepted when the target's output is listed. */
export type OutputType =
  | "Table"
  | "Fit"
  | "Comparison"
  | "Diagnostics"
  | "Predictions"
  | "Chart"
  | "Value"
  | "Ranked";

/** Document settings from the YAML front matter, with defaults filled in. */
export interface DocSettings {
  title: string;
  /** Confidence level for intervals, in (0, 1). Default 0.95. */
  confidence: number;
  /** Seed for anything random (multi-start, k-fold). Default 1. */
  seed: number;
  /** Default criterion for `compare`. Default "aicc". */
  criterion: string;
  /** Largest data file a table reads, in bytes. Default 512 MiB. */
  maxFileBytes: number;
  /** Everything else that was in the front matter. */
  extra: Record<string, unknown>;
}

/** What `parse` gets: one cell's options and ways to report about them. */
export interface ParseContext {
  /** The cell's name (second word of the fence's info string). */
  name: string;
  /** The cell's kind (first word). */
  kind: string;
  /** The YAML body as plain data (an empty mapping for an empty body). */
  options: Record<string, unknown>;
  /** The raw body text (what code kinds use). */
  body: string;
  settings: DocSettings;
  /** Records a warning shown on the cell; deduplicated by the kernel. */
  warn(message: string): void;
}

/** A reference from one cell to another, found by `inputs`. */
export interface InputRef {
  /** The referenced cell's name. */
  name: string;
  /** Output types this reference accepts. */
  accepts: readonly OutputType[];
  /** The option that holds the reference, for error positions. */
  path: OptionPath;
}

/** A data file a cell needs; the kernel reads it (relative to the document) and passes bytes. */
export interface FileRef {
  /** Path as written, relative to the document's folder. */
  path: string;
  /** The option that names the file, for error positions. */
  option: OptionPath;
}

/** A file's content as handed to `run`. */
export interface FileData {
  path: string;
  bytes: Uint8Array;
  /** Lower-case hex SHA-256 of `bytes`. */
  sha256: string;
}

/** What `run` gets besides its spec. */
export interface RunContext {
  name: string;
  settings: DocSettings;
  /** Outputs of the referenced cells, by cell name. */
  inputs: Readonly<Record<string, CellOutput>>;
  /** Contents of the files named by `files`, by path as written. */
  files: Readonly<Record<string, FileData>>;
  /** Records a warning shown on the cell; deduplicated by the kernel. */
  warn(message: string): void;
  /** Reports progress of long work, `fraction` in [0, 1]. */
  progress(fraction: number, note?: string): void;
}

/** Base of every cell output. */
export interface CellOutput {
  type: OutputType;
}

/** Props every kind's view receives. */
export interface ViewProps<R = unknown> {
  name: string;
  /** The kind's `summary` of its output (plain JSON). */
  result: R;
}

/**
 * A cell kind: a plug-in record. `Spec` must be plain JSON data (the kernel
 * hashes it to decide what reruns), `Out` the kind's output value and `R` the
 * RUN-JSON result object.
 */
export interface CellKind<Spec = unknown, Out extends CellOutput = CellOutput, R = unknown> {
  /** The kind's name as written in a fence's info string. */
  kind: string;
  /** What the body holds: YAML options, or code. */
  body: "yaml" | "code";
  /** The type of value `run` returns. */
  output: OutputType;
  /** One line on what the kind does (used by DEVELOPERS.md and errors). */
  description: string;
  /** The body a new cell of this kind starts with in the live workspace (optional). */
  template?: string;
  /** Options → spec. Throws {@link CellError} for bad options. */
  parse(ctx: ParseContext): Spec;
  /** The cells this one reads. */
  inputs(spec: Spec): InputRef[];
  /** The data files this one reads (optional). */
  files?(spec: Spec): FileRef[];
  /** Pure computation. Throws {@link CellError} for bad data. */
  run(spec: Spec, ctx: RunContext): Out | Promise<Out>;
  /**
   * The RUN-JSON `result` object (plain JSON). `leaveOut`, when given, names
   * top-level fields the caller drops (the live page's copy leaves out
   * per-row arrays no view reads, ui/page_fields.ts): a kind may skip
   * building them.
   */
  summary(out: Out, spec: Spec, leaveOut?: ReadonlySet<string>): R;
  /** One human line for the CLI summary. */
  line(result: R): string;
  /** The Preact view, shared by the live page and the static record. */
  view(props: ViewProps<R>): VNode;
}

// ---------------------------------------------------------------------------
// Values that flow between kinds.

/** A numeric column. Missing values are NaN. */
export interface NumberColumn {
  name: string;
  type: "number";
  unit: string | null;
  values: Float64Array;
  /**
   * Decimal corrections: `values[i] + lo[i]` is the number as printed in the
   * file, to double-double precision (about 32 digits). `null` when the table
   * did not keep them (large tables, derived columns).
   */
  lo: Float64Array | null;
  missing: number;
}

/** A text column. Missing values are null. */
export interface TextColumn {
  name: string;
  type: "text";
  unit: string | null;
  values: (string | null)[];
  missing: number;
}

export type Column = NumberColumn | TextColumn;

/** Output of `table`: typed columns over the rows kept after exclusions and filters. */
export interface Table extends CellOutput {
  type: "Table";
  columns: Column[];
  /** Source row number (1-based data row, before exclusions) of each kept row. */
  rows: Int32Array;
  rowsRead: number;
  excluded: { row: number; why: string }[];
  /** SHA-256 of the source file's bytes, when the table came from a file. */
  sha256: string | null;
  /** The source file path as written, when from a file. */
  source: string | null;
}
