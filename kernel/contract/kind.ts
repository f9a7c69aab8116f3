/**
 * The cell contract: what every cell kind provides. A kind has two faces,
 * kept side by side in its folder under `cells/`:
 *
 * ```
 *  compute face (CellKind, this file)          page face (PageFace)
 *  ───────────────────────────────────          ─────────────────────
 *  options ─▶ parse ─▶ spec ─▶ inputs/files    view(result) ─▶ the block's body
 *                       │                        (live page and static record)
 *  inputs' outputs ─────┴─▶ run ─▶ output
 *                                   │
 *                      summary ◀────┘  (RUN-JSON result; page copy less `page.omit`)
 * ```
 *
 * `parse` runs on the server's main thread (it needs only the options);
 * `run` and `summary` run in the compute worker, which has no permissions:
 * files arrive as bytes in {@link RunContext.files}. Outputs stay in the
 * worker's store; only summaries travel back. The compute face imports no UI
 * library; the page face is loaded by the browser bundle and the record only.
 *
 * Errors are thrown as {@link CellError} with an option path (and an offset
 * into a text value); the kernel turns that into a document line and column.
 *
 * @module
 */
import type { CellOutput, FileData, FileRef, InputRef, OutputType } from "./values.ts";
import type { DocSettings } from "./settings.ts";
import type { OptionDecls } from "./option_decl.ts";
import type { HistoryFace } from "./history.ts";
import type { CheckAnswer, IsolateAnswer, IsolateJob } from "../sandbox/mod.ts";
import type { EngineAccess } from "../engine/types.ts";

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
  /**
   * Reports progress of long work, `fraction` in [0, 1]. Throws (and the run
   * is answered as cancelled) when the kernel no longer wants the run.
   */
  progress(fraction: number, note?: string): void;
  /**
   * User code, checked and run outside the worker (kernel/sandbox): `check`
   * type-checks a TypeScript module in a child process, `run` runs one in a
   * disposable child process with no permissions, a heap cap and a time limit.
   * Both answer in plain words and never throw. A run whose cell the kernel
   * stops is killed and answered `stopped`. Absent where no process can be
   * started (contexts built by hand in tests).
   */
  sandbox?: {
    check(program: string): Promise<CheckAnswer>;
    run(job: IsolateJob): Promise<IsolateAnswer>;
  };
  /**
   * An input's complete RUN-JSON result as its own kind summarises it, and
   * the names of its per-row fields (`CellKind.rows`); null when not known.
   * Optional: absent in contexts built by hand.
   */
  summaryOf?(name: string): { result: unknown; rows: readonly string[] } | null;
  /**
   * Database access (kernel/engine): read-only SELECTs run in an engine
   * process of their own, asked for through the main thread; a stopped run
   * cancels its statements. Absent where no engine can be reached
   * (contexts built by hand in tests).
   */
  engine?: EngineAccess;
  /**
   * What the kind's `stamp` answered for this cell when the document was
   * planned (the fingerprint of a database query's answer), so the run need
   * not ask again. Absent for kinds without `stamp`, and in contexts built by hand.
   */
  stamp?: string;
}

/** What `stamp` gets: database access from the main thread. */
export interface StampContext {
  /** The cell's name. */
  name: string;
  settings: DocSettings;
  /** Database access (kernel/engine); the same engine processes the runs use. */
  engine: EngineAccess;
}

/** A column a cell offers other cells (a table's columns, by the kind's `columns`). */
export interface ColumnInfo {
  name: string;
  type: "number" | "text";
  unit: string | null;
}

/** One cell of the document, as a template sees it. */
export interface TemplateCell {
  name: string;
  kind: string;
  /** The kind's output type; null for a kind this registry does not know. */
  output: OutputType | null;
  /** The cells it reads. */
  inputs: readonly string[];
  /** The columns it offers, from its last result (empty when it has none yet). */
  columns: readonly ColumnInfo[];
  /** Its last result as the page has it (null when it has none). */
  result: unknown;
}

/** What `template` gets: the document's cells in order, with what they offer. */
export interface TemplateContext {
  cells: readonly TemplateCell[];
}

/** How the live page's copy of a result differs from the complete RUN-JSON result. */
export interface PageCopy<R = unknown, Out = CellOutput> {
  /** Top-level result fields that no page view reads (per-row arrays, mostly). */
  omit: readonly string[];
  /**
   * Stand-ins for large fields (a check's charts counted into cells): fields
   * to add and the fields they replace; null to keep the result as it is.
   */
  condense?(result: R): { add: Record<string, unknown>; omit: readonly string[] } | null;
  /**
   * The same stand-ins made from the output itself, where the kind can: the
   * compute worker asks this first when making a page copy, and leaves the
   * fields they replace out of the summary it builds (a 100,000-row check's
   * six plain arrays took 17–27 ms to build only to be dropped). Optional.
   */
  condenseOutput?(output: Out): { add: Record<string, unknown>; omit: readonly string[] } | null;
}

/**
 * A cell kind's compute face: a plug-in record. `Spec` must be plain JSON
 * data (the kernel hashes it to decide what reruns), `Out` the kind's output
 * value and `R` the RUN-JSON result object.
 */
export interface CellKind<Spec = unknown, Out extends CellOutput = CellOutput, R = unknown> {
  /** The kind's name as written in a fence's info string. */
  kind: string;
  /** What the body holds: YAML options, or code. */
  body: "yaml" | "code";
  /** The type of value `run` returns. */
  output: OutputType;
  /**
   * The output type of one cell, where its options decide it (a calc cell that
   * gives a table); optional: `output`.
   */
  outputOf?(spec: Spec): OutputType;
  /** One line on what the kind does (reference documentation and errors). */
  description: string;
  /** The options it understands, each declared once (key, type, default, one line). */
  options: OptionDecls;
  /** Options → spec. Throws {@link CellError} for bad options. */
  parse(ctx: ParseContext): Spec;
  /** The cells this one reads. */
  inputs(spec: Spec): InputRef[];
  /**
   * True when `run` can read inputs whose rows stay in a database
   * (`CellOutput.keptIn`); other kinds are refused such inputs, in a sentence.
   */
  readsKept?: boolean;
  /** The data files this one reads (optional). */
  files?(spec: Spec): FileRef[];
  /**
   * A fingerprint of what the cell reads from outside the document other than
   * its files (a database query's row count and hash of its values), asked on
   * the main thread when the document is planned. It enters the cell's cache
   * key as a data file's SHA-256 does, so a changed answer reruns the cell and
   * what reads it; the run gets it back as `RunContext.stamp`. A live session
   * asks again from time to time (kernel/server/live_workspace.ts). Returns
   * null where the cell reads nothing of the kind (a table from a file);
   * rejects with a CellError on the option at fault. Optional.
   */
  stamp?(spec: Spec, ctx: StampContext): Promise<string> | null;
  /**
   * What the cell will need outside the worker, started while its inputs
   * compute (optional): `sandboxMb`, a sandbox process with that memory cap
   * (its start-up is most of a first run's time).
   */
  ahead?(spec: Spec): { sandboxMb?: number };
  /** Pure computation. Throws {@link CellError} for bad data. */
  run(spec: Spec, ctx: RunContext): Out | Promise<Out>;
  /**
   * The RUN-JSON `result` object (plain JSON). `leaveOut`, when given, names
   * top-level fields the caller drops (the page copy's `page.omit`): a kind
   * may skip building them.
   */
  summary(out: Out, spec: Spec, leaveOut?: ReadonlySet<string>): R;
  /** One human line for the CLI summary. */
  line(result: R): string;
  /**
   * More lines for the CLI summary under that line (optional), e.g. a fit's
   * estimates with their uncertainty and interval.
   */
  details?(result: R): string[];
  /** How the page's copy of a result is made smaller (optional: the whole result). */
  page?: PageCopy<R, Out>;
  /**
   * The result's per-row fields: top-level RUN-JSON fields holding one value
   * per used row (fitted values, residuals, row numbers). `plumb run` leaves
   * them out unless asked for JSON with them (`--without-rows` leaves them out
   * of RUN-JSON too), passing them to `summary` as `leaveOut`. Optional: none.
   */
  rows?: readonly string[];
  /** The columns a result offers other cells (tables; optional). */
  columns?(result: R): ColumnInfo[];
  /** The body of a new cell of this kind that runs on the document at hand. */
  template(ctx: TemplateContext): string;
  /**
   * What the run history keeps of a result and how two kept results differ
   * (optional: a kind without it is recorded by state only).
   */
  history?: HistoryFace<Spec, Out, R>;
}

/** Props every kind's view receives. */
export interface ViewProps<R = unknown> {
  name: string;
  /** The kind's summary of its output (plain JSON), or its page copy. */
  result: R;
}

/**
 * A cell kind's page face: its view, shared by the live page and the static
 * record. `V` is the view library's node type (the kernel names none).
 */
export interface PageFace<R = unknown, V = unknown> {
  kind: string;
  view(props: ViewProps<R>): V;
}
