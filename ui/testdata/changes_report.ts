/**
 * A hand-made change report with invented numbers, for the tests of the
 * "Since the last data" panel and the record's section: a preferred model
 * that changed, a parameter that left its interval, a minor change, rows
 * added to a data file, and three revisions of a fit's parameters (one
 * series recorded only once, so it draws no chart).
 *
 * @module
 */
import type { ChangeReport } from "../../kernel/history/types.ts";

/** The three records' times (a week apart, then a day). */
export const TIMES = [
  "2026-11-20T08:00:00.000Z",
  "2026-11-27T08:00:00.000Z",
  "2026-11-28T09:30:00.000Z",
] as const;

/** The sentences of {@link changesReport}, in the report's order. */
export const SENTENCES = {
  preferred: "The preferred model of pick changed from slow to fast: ΔAICc went from +1.2 to −9.8.",
  moved: "slow: k moved from 1.5 [1.0, 2.0] to 2.6 [2.3, 2.9], outside its previous 95% interval.",
  rows: "readings: 4 rows added (rows 11–14).",
  fitted: "slow: fitted to 14 rows (was 10).",
} as const;

/**
 * The report, new each call (tests may change it).
 *
 * @returns A report comparing the second record with the third.
 */
export function changesReport(): ChangeReport {
  const [t0, t1, t2] = TIMES;
  return {
    from: { record: `${t1}-bbbbbbbb`, time: t1 },
    to: { record: `${t2}-cccccccc`, time: t2 },
    baseline: "previous data revision",
    document_changed: false,
    files: [{ path: "data/a.csv", before: "1", after: "2", lines_before: 11, lines_after: 15 }],
    sentences: [SENTENCES.preferred, SENTENCES.moved, SENTENCES.rows, SENTENCES.fitted],
    cells: [
      {
        name: "readings",
        kind: "table",
        state_before: "current",
        state_after: "current",
        changes: [{
          code: "rows-added",
          weight: "minor",
          sentence: SENTENCES.rows,
          numbers: { added: 4, first: 11, last: 14 },
        }],
      },
      {
        name: "slow",
        kind: "fit",
        state_before: "current",
        state_after: "current",
        changes: [
          {
            code: "parameter-moved",
            weight: "notable",
            sentence: SENTENCES.moved,
            numbers: { before: 1.5, after: 2.6, before_ci: [1, 2], z: 3.4 },
          },
          {
            code: "rows-used-changed",
            weight: "minor",
            sentence: SENTENCES.fitted,
            numbers: { before: 10, after: 14 },
          },
        ],
      },
      {
        name: "pick",
        kind: "compare",
        state_before: "current",
        state_after: "current",
        changes: [{
          code: "preferred-changed",
          weight: "notable",
          sentence: SENTENCES.preferred,
          numbers: { before: "slow", after: "fast", delta_before: 1.2, delta_after: -9.8 },
        }],
      },
    ],
    cells_added: [],
    cells_removed: [],
    trends: [
      {
        cell: "slow",
        series: "k",
        unit: "1/s",
        points: [
          { record: `${t0}-aaaaaaaa`, time: t0, n: 6, value: 1.4, lower: 0.6, upper: 2.2 },
          { record: `${t1}-bbbbbbbb`, time: t1, n: 10, value: 1.5, lower: 1, upper: 2 },
          { record: `${t2}-cccccccc`, time: t2, n: 14, value: 2.6, lower: 2.3, upper: 2.9 },
        ],
      },
      {
        cell: "slow",
        series: "c",
        unit: null,
        points: [
          { record: `${t0}-aaaaaaaa`, time: t0, n: 6, value: 0.2, lower: -0.1, upper: 0.5 },
          { record: `${t1}-bbbbbbbb`, time: t1, n: 10, value: 0.25, lower: 0, upper: 0.5 },
          { record: `${t2}-cccccccc`, time: t2, n: 14, value: 0.3, lower: 0.1, upper: 0.5 },
        ],
      },
      {
        cell: "slow",
        series: "once",
        unit: null,
        points: [{ record: `${t2}-cccccccc`, time: t2, n: 14, value: 1, lower: null, upper: null }],
      },
    ],
    history: { path: "a.history.jsonl", records: 3, problems: [] },
  };
}
