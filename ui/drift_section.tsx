/**
 * The drift of the estimates, inside the "Since the last data" panel: one
 * small chart per series of the report's trends (a fit's parameters, a
 * prediction's points) that has two recorded revisions or more, grouped
 * under their cell in document order, each fit in its own colour. Drawn by
 * ui/charts/drift_chart.ts with Observable Plot: the live page inserts the
 * element, the static record inlines the SVG.
 *
 * @module
 */
import type { VNode } from "preact";
import type { ChangeReport, Trend } from "../kernel/history/types.ts";
import { fitColor, INK } from "../cells/shared/palette.ts";
import { DrawnFigure } from "./charts/chart_figure.tsx";
import { renderDriftChart } from "./charts/drift_chart.ts";

/** One cell's drawable series. */
export interface DriftGroup {
  cell: string;
  kind: string | null;
  series: Trend[];
}

/**
 * The drawable series (two points or more), grouped by cell in the report's order.
 *
 * @param report The change report.
 * @returns The groups, none empty.
 * @example
 * ```ts
 * import { driftGroups } from "./drift_section.tsx";
 * const p = (record: string) => ({ record, time: record, n: 1, value: 1, lower: null, upper: null });
 * const groups = driftGroups({
 *   cells: [{ name: "f", kind: "fit", state_before: "current", state_after: "current", changes: [] }],
 *   trends: [
 *     { cell: "f", series: "a", unit: null, points: [p("r1"), p("r2")] },
 *     { cell: "f", series: "b", unit: null, points: [p("r2")] },
 *   ],
 * });
 * if (groups.length !== 1 || groups[0].series.length !== 1) throw new Error("one drawable series");
 * ```
 */
export function driftGroups(report: Pick<ChangeReport, "cells" | "trends">): DriftGroup[] {
  const kinds = new Map(report.cells.map((c) => [c.name, c.kind]));
  const groups = new Map<string, DriftGroup>();
  for (const t of report.trends) {
    if (t.points.length < 2) continue;
    let g = groups.get(t.cell);
    if (!g) groups.set(t.cell, g = { cell: t.cell, kind: kinds.get(t.cell) ?? null, series: [] });
    g.series.push(t);
  }
  return [...groups.values()];
}

function DriftChart(props: { trend: Trend; color: string; baseline: string }): VNode {
  const t = props.trend;
  const draw = (d: Document) =>
    renderDriftChart(t, {
      color: props.color,
      baseline: props.baseline,
      label: `${t.cell}: ${t.series}${
        t.unit ? ` (${t.unit})` : ""
      } over ${t.points.length} revisions`,
    }, d);
  return (
    <div class="pl-drift-chart">
      <p class="pl-drift-name">
        {t.series}
        {t.unit && <span class="pl-drift-unit">({t.unit})</span>}
      </p>
      <DrawnFigure draw={draw} data={t} />
    </div>
  );
}

/**
 * The drift disclosure, or nothing when no series has two points.
 *
 * @param props The report; `open` opens the disclosure (the record).
 * @returns A `<details>` of grouped drift charts.
 */
export function DriftSection(props: { report: ChangeReport; open?: boolean }): VNode | null {
  const groups = driftGroups(props.report);
  if (groups.length === 0) return null;
  const revisions = new Set(
    groups.flatMap((g) => g.series.flatMap((t) => t.points.map((p) => p.record))),
  ).size;
  return (
    <details class="pl-drift" open={props.open}>
      <summary>How the estimates moved over {revisions} recorded revisions</summary>
      <p class="pl-drift-key">
        Each bar is a revision's estimate with its interval, the newest filled; the shaded strip is
        the interval of the earlier revision compared above.
      </p>
      {groups.map((g) => (
        <section key={g.cell} class="pl-drift-group" aria-label={`drift of ${g.cell}`}>
          <h3>
            {g.cell}
            {g.kind && <span class="pl-drift-kind">{g.kind}</span>}
          </h3>
          <div class="pl-drift-grid">
            {g.series.map((t) => (
              <DriftChart
                key={t.series}
                trend={t}
                color={g.kind === "fit" ? fitColor(g.cell) : INK}
                baseline={props.report.from.record}
              />
            ))}
          </div>
        </section>
      ))}
    </details>
  );
}
