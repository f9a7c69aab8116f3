/**
 * The types a session reports and is configured with (kernel/session/session.ts).
 *
 * @module
 */
import type { DocSettings } from "../contract/mod.ts";
import type { ParsedDocument } from "../document/mod.ts";
import type { LocatedError } from "../errors.ts";
import type { Graph } from "../graph/build.ts";
import type { Registry } from "../contract/mod.ts";

/** The states of a cell, in our own words. */
export type CellState = "current" | "queued" | "computing" | "failed" | "held";

/** The state and result of one cell after a run. */
export interface CellReport {
  name: string;
  kind: string;
  line: number;
  /** The cells it reads directly. */
  inputs?: readonly string[];
  state: CellState;
  error: { message: string; line: number; column: number } | null;
  warnings: string[];
  /** The kind's summary (RUN-JSON `result`); null unless current. */
  result: unknown;
  /** One human line of the result. */
  summaryLine: string | null;
  /** Time the computation took (when it last ran), in milliseconds. */
  ms: number;
  /** True when this run reused a cached result. */
  cached: boolean;
  /** With `page: true`: the fields of the complete result left out of `result`. */
  omitted?: string[];
  /**
   * With `history: true`, what the run history keeps of a current cell's result
   * (the kind's `history.keep`; null when it failed, absent for a kind without one).
   */
  kept?: unknown;
  /**
   * With `page: true`, a current cell's result as the worker wrote it for the
   * page (`result` is then parsed from its text when first read).
   */
  page?: PageText;
}

/** A page copy of a result as JSON text, and what tells equal texts apart from others. */
export interface PageText {
  /** The page copy as JSON text, as the compute worker wrote it. */
  json: string;
  /**
   * Equal for equal texts: the cell's cache key, followed by the fields kept
   * beyond the page copy when inline values name some (`key+residuals`).
   */
  id: string;
}

/** The outcome of a run. */
export interface RunReport {
  settings: DocSettings;
  cells: CellReport[];
  /** Errors outside cells: front matter, inline references in prose. */
  errors: { message: string; line: number; column: number }[];
  /**
   * The data files the run read, in the order first read: path as written,
   * SHA-256, size and text lines (line feeds, plus an unterminated last line).
   */
  files: { path: string; sha256: string; bytes: number; lines: number }[];
  /** Names of the cells computed by this run, in the order they were sent to a worker. */
  ran: string[];
  superseded: boolean;
}

/** The sync part of a run: what would be computed. */
export interface Plan {
  doc: ParsedDocument;
  settings: DocSettings;
  graph: Graph;
  docErrors: LocatedError[];
  /** Cache key of every cell that can run (static errors and held cells have none). */
  keys: Map<string, string>;
  /** Cells whose key has no cached outcome: these will compute. */
  stale: string[];
}

/** A state change, for live views. */
export interface SessionEvent {
  name: string;
  state: CellState;
  fraction?: number;
  note?: string;
  /** The cell's report, when it settles (current, failed or held). */
  report?: CellReport;
}

/** Options of a session. */
export interface SessionOptions {
  registry: Registry;
  /** The compute worker entry module (for the product: `cells/worker.ts`). */
  workerUrl: URL;
  /** The document's folder, where data files are looked up. */
  dir: string;
  onEvent?: (e: SessionEvent) => void;
  /**
   * Results as the live page reads them (kernel/worker/page_copy.ts: no
   * per-row arrays that no view shows, except fields the document's inline
   * values name), made in the worker and kept as its JSON text
   * (`CellReport.page`). Default false: complete results (RUN-JSON).
   */
  page?: boolean;
  /** Compute workers (default: two on four or more cores, else one; kernel/worker/pool.ts). */
  workers?: number;
  /**
   * Complete results less each kind's per-row fields (`CellKind.rows`), except
   * those the document's inline values name; `CellReport.omitted` lists what
   * was left out. Ignored with `page`. Default false.
   */
  lean?: boolean;
  /**
   * Ask each kind for what the run history keeps of its results
   * (`CellReport.kept`; kernel/history). Default false.
   */
  history?: boolean;
  /**
   * The session runs its document once (`plumb run`): a data file's bytes are
   * let go (here and in the workers) as soon as every cell reading it has
   * settled, since no later run will want them; the run's report still gives
   * each file's SHA-256, size and lines. Default false (a live session keeps
   * them for the next run).
   */
  once?: boolean;
}
