/**
 * The run history's face of a cell kind: what the history keeps of a result,
 * what changed between two kept results, and the values worth drawing over
 * the recorded revisions. The kernel writes and reads the history file
 * (kernel/history) and assembles the change report; only the kinds know what
 * their results mean.
 *
 * ```
 *  worker:   run ─▶ output ─▶ keep(out, spec, result) ─▶ kept (small plain JSON)
 *  kernel:   history record = { time, document, files, cells: [{ name, kind, state, kept }] }
 *  report:   changes(before.kept, after.kept, ctx) ─▶ Change[]   (per cell, both records current)
 *            trend(kept) ─▶ TrendSample[]                        (per record, drawn over time)
 * ```
 *
 * @module
 */

/** Rows that changed in the tables a cell reads (directly or through other cells). */
export interface RowChanges {
  /** Rows whose content is new in the newer table. */
  added: number;
  /** Rows of the older table whose content is gone. */
  removed: number;
  /** Rows at the same position whose content differs (counted in neither of the above). */
  changed: number;
}

/** What `changes` gets besides the two kept results. */
export interface ChangeContext {
  /** The cell's name. */
  cell: string;
  /** The document's confidence level (of the newer record). */
  level: number;
  /**
   * Rows added, removed and changed in the tables this cell reads, summed over
   * them; null when no table it reads reported row changes (or none exists).
   */
  rows: RowChanges | null;
}

/** One change a kind found between two kept results of a cell. */
export interface Change {
  /**
   * A stable code naming what changed, ours (documented in docs/history.md):
   * `rows-added`, `parameter-moved`, `preferred-changed`, `finding-appeared`, …
   */
  code: string;
  /**
   * `notable` bears on a decision (a preferred model changed, an estimate left
   * its previous interval, a finding appeared); `minor` is worth knowing.
   */
  weight: "notable" | "minor";
  /** One plain sentence that names the cell and says what changed, with the key numbers. */
  sentence: string;
  /** The numbers behind the sentence (plain JSON; documented per code). */
  numbers: Record<string, unknown>;
  /** With `rows-*` codes from tables: the row changes this adds to its readers' context. */
  rows?: RowChanges;
}

/** One value of a kept result worth drawing over the revisions (a fit parameter). */
export interface TrendSample {
  /** The series it belongs to, e.g. the parameter's name. */
  series: string;
  /** Its unit, or null. */
  unit: string | null;
  /** The estimate. */
  value: number;
  /** The interval at the record's level, when there is one. */
  lower: number | null;
  upper: number | null;
  /** Rows used (the natural x of a drift chart besides time), when known. */
  n: number | null;
}

/**
 * A kind's history face (optional in {@link CellKind}). `H` is what the
 * history keeps: plain JSON, small (no per-row arrays beyond what a content
 * comparison needs), stable across versions (a newer Plumb reads older records;
 * missing fields are treated as unknown, never as zero).
 */
export interface HistoryFace<Spec = unknown, Out = unknown, R = unknown, H = unknown> {
  /** What the history keeps of a result. Runs in the compute worker, beside `summary`. */
  keep(out: Out, spec: Spec, result: R): H;
  /**
   * What changed from `before` to `after` (both kept by this kind for the
   * same cell). Returns nothing when nothing worth a sentence changed.
   * Must not throw on records written by older versions (missing fields).
   */
  changes(before: H, after: H, ctx: ChangeContext): Change[];
  /** The values to draw over the revisions (optional). */
  trend?(kept: H): TrendSample[];
}
