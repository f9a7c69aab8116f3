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
  /**
   * Seconds a database statement may run before the engine stops it; 0 for
   * no limit (`query_time_limit: none`). Absent: the default, 1,800
   * (`QUERY_TIME_LIMIT_DEFAULT` in kernel/engine/types.ts). Read on the
   * main thread when a run asks its engine (kernel/worker/client.ts).
   */
  queryTimeLimit?: number;
  /**
   * Interval methods a fit computes by default (`intervals: [wald, profile]`):
   * any of "wald", "profile", "bootstrap"; a fit's own `intervals` option
   * overrides it. Absent: Wald, and profile likelihood for nonlinear fits.
   */
  intervals?: string[];
  /** Everything else that was in the front matter. */
  extra: Record<string, unknown>;
}
