/**
 * Drift charts (invented series): the choice of x axis (time, rows used,
 * revision number) and what is drawn, read back from the SVG made with
 * linkedom: an interval bar per revision that has one, the earlier
 * estimates as rings, the newest filled, the compared revision's interval
 * as a strip, the axis named.
 */
import { equal, ok } from "node:assert/strict";
import type { Trend } from "../../kernel/history/types.ts";
import { driftAxis, renderDriftChart } from "./drift_chart.ts";
import { chartDocument } from "./svg_document.ts";

type Point = Trend["points"][number];

const point = (time: string, n: number | null, value = 1): Point => ({
  record: `${time}-00000000`,
  time,
  n,
  value,
  lower: value - 0.5,
  upper: value + 0.5,
});

Deno.test("driftAxis draws against time while the records are spread out", () => {
  const weekly = ["2026-11-06", "2026-11-13", "2026-11-20"].map((d) => point(`${d}T08:00:00Z`, 10));
  equal(driftAxis(weekly), "time", "the rows used alike do not matter on a time axis");
});

Deno.test("driftAxis takes the rows used when two records are too close in time", () => {
  // Two runs 3 minutes apart in a history of two weeks: 3 min / 14 days < 1/25.
  const close = [
    point("2026-11-06T08:00:00Z", 10),
    point("2026-11-20T08:00:00Z", 14),
    point("2026-11-20T08:03:00Z", 18),
  ];
  equal(driftAxis(close), "rows");
  // A span under a minute (a test appending rows): rows used.
  equal(driftAxis([point("2026-11-20T08:00:00Z", 10), point("2026-11-20T08:00:05Z", 14)]), "rows");
});

Deno.test("driftAxis numbers the revisions when rows used are unknown or repeat", () => {
  const t = ["2026-11-20T08:00:00Z", "2026-11-20T08:00:05Z", "2026-11-20T08:00:09Z"];
  equal(driftAxis(t.map((x) => point(x, null))), "revision");
  equal(driftAxis(t.map((x, i) => point(x, i === 2 ? 10 : 10 + i))), "revision");
});

function draw(points: Point[], baseline: string | null): Element {
  const trend: Trend = { cell: "slow", series: "k", unit: "1/s", points };
  return renderDriftChart(trend, { baseline, color: "#0072B2" }, chartDocument());
}

const marks = (svg: Element, what: string) => svg.querySelectorAll(`[aria-description="${what}"]`);

Deno.test("renderDriftChart draws each interval, the earlier estimates as rings and the newest filled", () => {
  const pts = [
    point("2026-11-06T08:00:00Z", 10, 1.5),
    point("2026-11-13T08:00:00Z", 14, 1.6),
    { ...point("2026-11-20T08:00:00Z", 18, 2.6), lower: null, upper: null },
  ];
  const svg = draw(pts, pts[1].record);
  equal(svg.getAttribute("role"), "img");
  equal(svg.getAttribute("aria-label"), "slow k over 3 revisions");
  equal(marks(svg, "interval")[0].querySelectorAll("line").length, 2, "the newest has no interval");
  equal(marks(svg, "earlier")[0].querySelectorAll("circle").length, 2);
  const newest = marks(svg, "newest")[0];
  equal(newest.querySelectorAll("circle").length, 1);
  equal(newest.getAttribute("fill"), "#0072B2");
  equal(marks(svg, "interval of the revision compared")[0].querySelectorAll("rect").length, 1);
  ok(svg.textContent!.includes("record time (UTC)"));
  ok(svg.textContent!.includes("6 Nov") && svg.textContent!.includes("20 Nov"), "the end dates");
});

Deno.test("renderDriftChart labels rows used at each revision, and draws no strip without a baseline", () => {
  const pts = [point("2026-11-20T08:00:00Z", 119, 9.9), point("2026-11-20T08:00:04Z", 159, 10.6)];
  const svg = draw(pts, null);
  equal(marks(svg, "interval of the revision compared").length, 0);
  ok(svg.textContent!.includes("rows used"));
  ok(svg.textContent!.includes("119") && svg.textContent!.includes("159"));
});
