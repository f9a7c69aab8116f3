/**
 * Document settings: what the YAML front matter sets for every cell
 * (kernel/document/read_settings.ts reads and checks them).
 *
 * @module
 */

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
  /**
   * Records the run history keeps (kernel/history); 0 keeps none (`history: off`).
   * Absent: the default, 100.
   */
  history?: number;
  /** Everything else that was in the front matter. */
  extra: Record<string, unknown>;
}
