/**
 * The page's style sheet, as a string the entry point puts in a `<style>`
 * element (one file to serve, nothing to fetch). Calm neutral ink on paper,
 * one accent colour (a deep teal), states by shape and word, dense tables
 * with aligned figures. From a phone (360 px) to a wide screen (2560 px):
 * beside the report from 62rem up, the rail sticks under the top bar (its
 * height measured into `--pl-top-h`, ui/top_bar.tsx); narrower, it follows
 * the report in the flow and the top bar links to it, so nothing pinned ever
 * covers the report. Wide tables scroll inside themselves; charts take the
 * column's width down to a legible 30rem, then scroll inside their figure.
 * Print rules: ui/print_style.ts.
 *
 * @module
 */

import { PRINT_STYLE } from "./print_style.ts";

/** The style sheet. */
export const STYLE = `
:root {
  --paper: #fbfaf6; --ink: #23221f; --muted: #6b675f; --rule: #dcd8cd; --wash: #f1efe8;
  --accent: #17645a; --accent-wash: #e3efec;
  --serif: "Iowan Old Style", "Charter", "Source Serif Pro", Georgia, serif;
  --sans: system-ui, "Segoe UI", "Helvetica Neue", Arial, sans-serif;
  --mono: ui-monospace, "SF Mono", "Cascadia Mono", "DejaVu Sans Mono", Menlo, monospace;
}
* { box-sizing: border-box; }
html { background: var(--paper); color: var(--ink); }
body { margin: 0; font: 15px/1.5 var(--sans); }
a { color: var(--accent); text-decoration-thickness: 1px; text-underline-offset: 2px; }
:focus-visible { outline: 2px solid var(--accent); outline-offset: 2px; }
code, pre, textarea { font-family: var(--mono); font-size: 13px; }
.pl-sr { position: absolute; width: 1px; height: 1px; overflow: hidden; clip: rect(0 0 0 0); }
.pl-muted { color: var(--muted); }

.pl-top { position: sticky; top: 0; z-index: 2; display: flex; flex-wrap: wrap; align-items: baseline;
  gap: 0 1.25rem; padding: .45rem 1.25rem; background: var(--paper); border-bottom: 1px solid var(--rule); }
.pl-title { margin: 0; font: 600 15px/1.3 var(--sans); }
.pl-data, .pl-overall, .pl-conn { margin: 0; font-size: 13px; color: var(--muted); }
.pl-overall { margin-left: auto; color: var(--ink); }
.pl-top-tools { margin: 0; font-size: 13px; }
.pl-to-rail { display: none; }
.pl-offline .pl-overall { font-weight: 600; }
.pl-printed { display: none; }
.pl-undo { flex-basis: 100%; margin: .2rem 0 0; font-size: 13px; }
.pl-undo kbd { font: 11px var(--mono); border: 1px solid var(--rule); border-radius: 2px; padding: 0 .25em; }

.pl-body { display: grid; grid-template-columns: minmax(0, 48rem) 17rem; gap: 2.5rem;
  justify-content: center; padding: 1.25rem 1.25rem 4rem; }
/* Under 62rem the rail follows the report in the flow: never stuck, never over it. */
@media (max-width: 62rem) {
  .pl-body { grid-template-columns: minmax(0, 1fr); gap: 1.5rem; }
  .pl-rail { position: static !important; max-height: none !important; overflow: visible !important;
    border-top: 1px solid var(--rule); padding-top: .75rem; }
  .pl-to-rail { display: inline; }
}
/* A phone: the top bar scrolls away with the page; tighter margins give the report the width. */
@media (max-width: 40rem) {
  .pl-top { position: static; padding: .4rem .75rem; }
  .pl-body { padding: .75rem .6rem 3rem; }
  .pl-cell { padding-left: .45rem; }
  .pl-prose { font-size: 16px; }
  .pl-cell-actions { margin-left: 0; }
}
.pl-main { min-width: 0; }

.pl-prose { font: 17px/1.6 var(--serif); max-width: 40rem; overflow-wrap: break-word; }
.pl-prose-failed .pl-error { font: 600 15px/1.4 var(--sans); }
.pl-prose-source { max-height: 16rem; overflow: auto; white-space: pre-wrap; overflow-wrap: anywhere;
  margin: .35rem 0 .8rem; padding: .5rem .75rem; background: var(--wash); border-left: 3px solid var(--ink); }
.pl-math-error code { overflow-wrap: anywhere; }
.pl-prose blockquote { margin: .55rem 0; padding-left: .8rem; border-left: 2px solid var(--rule); }
.pl-prose :is(ul, ol) { padding-left: 1.3rem; }
/* Six levels indent; deeper ones (markdown-it allows twenty) stay put, so a phone is never overrun. */
.pl-prose :is(ul, ol, blockquote) :is(ul, ol, blockquote) :is(ul, ol, blockquote) :is(ul, ol, blockquote)
  :is(ul, ol, blockquote) :is(ul, ol, blockquote) :is(ul, ol, blockquote) { padding-left: 0; margin-left: 0; }
.pl-math-why { font: italic 14px/1.4 var(--sans); color: var(--muted); }
.pl-prose h1, .pl-prose h2, .pl-prose h3 { font-family: var(--sans); line-height: 1.25; }
.pl-prose h1 { font-size: 1.55rem; margin: .6rem 0 .8rem; }
.pl-prose h2 { font-size: 1.2rem; margin: 1.8rem 0 .5rem; }
.pl-prose h3 { font-size: 1.05rem; margin: 1.4rem 0 .4rem; }
.pl-prose p { margin: .55rem 0; }
.pl-prose code { background: var(--wash); padding: 0 .2em; border-radius: 2px; }
.pl-prose-code { background: var(--wash); padding: .5rem .75rem; overflow-x: auto; }
.pl-math-display { margin: .6rem 0; overflow-x: auto; }
.pl-ref { font-family: var(--sans); font-variant-numeric: tabular-nums; border-bottom: 1px dotted var(--accent); }
.pl-ref-error { border-bottom: 1.5px solid var(--ink); font-weight: 600; font-size: .9em; }
.pl-ref-wait { color: var(--muted); }

/* Blocks off screen skip style, layout and paint until scrolled near (their last size is kept). */
.pl-cell { margin: 1rem 0 1.25rem; border-top: 1px solid var(--rule); border-left: 3px solid transparent;
  padding: 0 0 .25rem .75rem; content-visibility: auto; contain-intrinsic-size: auto 360px; }
.pl-cell-failed { border-left: 3px solid var(--ink); }
.pl-cell-held { border-left: 3px dashed var(--muted); }
.pl-cell-head { display: flex; flex-wrap: wrap; align-items: baseline; gap: .6rem; padding: .3rem 0;
  font-size: 12.5px; color: var(--muted); position: relative; }
.pl-cell-kind { text-transform: lowercase; letter-spacing: .04em; font-variant: small-caps; }
.pl-cell-name { margin: 0; font: 600 14px/1.3 var(--mono); color: var(--ink); }
.pl-cell-ms { font-variant-numeric: tabular-nums; }
.pl-cell-actions { margin-left: auto; display: flex; gap: .6rem; }
.pl-state { display: inline-flex; gap: .3em; align-items: baseline; color: var(--ink); }
.pl-state-shape { font-size: 11px; }
.pl-state-current .pl-state-shape { color: var(--accent); }
.pl-state-failed { font-weight: 700; }
.pl-state-computing .pl-state-shape { display: inline-block; animation: pl-turn 1.2s linear .3s infinite; }
@keyframes pl-turn { to { transform: rotate(360deg); } }
.pl-result { overflow-x: auto; }
/* A wide table is its own scroller: the block keeps the column's width, the figures stay on one line. */
.pl-result table { display: block; width: max-content; max-width: 100%; overflow-x: auto;
  background: linear-gradient(to right, var(--paper) 30%, transparent) left / 2rem 100% no-repeat local,
    linear-gradient(to left, var(--paper) 30%, transparent) right / 2rem 100% no-repeat local,
    linear-gradient(to right, rgba(0,0,0,.12), transparent) left / .6rem 100% no-repeat scroll,
    linear-gradient(to left, rgba(0,0,0,.12), transparent) right / .6rem 100% no-repeat scroll; }
.pl-result td { white-space: nowrap; }
/* Charts take the column's width; below 30rem they keep that width (text stays legible) and scroll. */
.pl-result figure { max-width: 100%; overflow-x: auto; margin-left: 0; margin-right: 0; }
.pl-result figure svg { max-width: 100%; height: auto; }
@media (max-width: 40rem) { .pl-result figure svg { min-width: 30rem; } }
/*
 * Busy signs wait .3 s: work that ends sooner (most updates) shows the state
 * word alone, with no dimming, sliding or turning that would flicker and make
 * the page redraw; the dimming is undone at once when the result arrives.
 */
.pl-stale { opacity: .55; transition: opacity .15s .3s; }
/* A failed or held cell's last result: folded, and marked as of an earlier run when opened. */
.pl-earlier { margin: .3rem 0; }
.pl-earlier > summary { cursor: pointer; font-size: 12.5px; color: var(--muted); }
.pl-earlier[open] > .pl-result { opacity: .6; border-left: 2px dashed var(--muted); padding-left: .6rem; }

/* Over the header's bottom rule, so showing it moves nothing on the page. */
.pl-progress { position: absolute; left: 0; right: 0; bottom: -2px; height: 3px; background: var(--wash);
  overflow: hidden; animation: pl-show 0s .3s backwards; }
.pl-progress > span { position: absolute; inset: 0 auto 0 0; background: var(--accent); transition: width .2s; }
.pl-progress-open > span { width: 30%; animation: pl-slide 1.1s ease-in-out .3s infinite; }
.pl-progress-note { font-size: 11px; font-style: normal; color: var(--muted); }
@keyframes pl-show { from { visibility: hidden; } to { visibility: hidden; } }
@keyframes pl-slide { from { left: -30%; } to { left: 100%; } }
@media (prefers-reduced-motion: reduce) { .pl-progress-open > span, .pl-state-computing .pl-state-shape { animation: none; } }

.pl-error { margin: .35rem 0; font-weight: 600; }
.pl-where { font-weight: 400; color: var(--muted); font-size: 13px; }
.pl-note { margin: .35rem 0; color: var(--muted); }
.pl-warnings { margin: .3rem 0; padding: 0; list-style: none; font-size: 13.5px; }
.pl-changes { border: 1px solid var(--rule); border-left: 4px solid var(--accent); background: var(--accent-wash);
  padding: .6rem .9rem; margin: 0 0 1.4rem; overflow-wrap: anywhere; max-width: 100%; box-sizing: border-box; }
.pl-changes h2 { font: 600 1rem/1.3 var(--sans); margin: 0 0 .3rem; }
.pl-changes-compared { display: grid; grid-template-columns: max-content minmax(0, 1fr); gap: 0 .9rem;
  margin: 0 0 .4rem; font-size: .85rem; }
.pl-changes-compared dt { grid-column: 1; color: var(--muted); }
.pl-changes-compared dd { grid-column: 2; margin: 0; }
@media (max-width: 40rem) { .pl-changes-compared { display: block; }
  .pl-changes-compared dt { margin-top: .15rem; font-size: .75rem; } }
.pl-changes-list, .pl-changes-notes { margin: .4rem 0; padding-left: 1.1rem; }
.pl-changes-notes { list-style: "! "; }
.pl-change { margin: .2rem 0; }
.pl-change-notable .pl-change-text { font-weight: 500; }
.pl-change-numbers { display: inline; margin-left: .4em; font-size: .8rem; }
.pl-change-numbers summary { display: inline; cursor: pointer; color: var(--accent); }
.pl-change-numbers table { margin: .2rem 0 .4rem; border-collapse: collapse; font: .8rem/1.35 var(--mono); }
.pl-change-numbers th { text-align: left; font-weight: 400; color: var(--muted); padding-right: .8rem; }
.pl-changes-more > summary, .pl-drift > summary { cursor: pointer; color: var(--accent); margin-top: .3rem; }
.pl-drift-key { margin: .3rem 0 0; font-size: .8rem; color: var(--muted); }
.pl-drift-group h3 { margin: .6rem 0 .25rem; font: 600 .85rem/1.3 var(--mono); }
.pl-drift-kind { margin-left: .5em; font: 400 .75rem var(--sans); color: var(--muted); }
.pl-drift-grid { display: flex; flex-wrap: wrap; gap: .4rem .8rem; }
.pl-drift-chart { flex: 0 1 260px; min-width: 0; max-width: 100%; box-sizing: border-box; padding: .2rem .3rem 0;
  background: var(--paper); border: 1px solid var(--rule); }
.pl-drift-name { margin: 0; font: 600 .78rem/1.3 var(--sans); }
.pl-drift-unit { margin-left: .3em; font-weight: 400; color: var(--muted); }
.pl-drift-chart figure { margin: 0; }
.pl-drift-chart svg { display: block; max-width: 100%; height: auto; }
.pl-doc-errors { list-style: none; padding: .4rem .75rem; border-left: 3px solid var(--ink); }

.pl-src { margin: .25rem 0 .5rem; padding: .4rem 0; background: var(--wash); overflow-x: auto; line-height: 1.45; }
.pl-src-line { display: block; white-space: pre; }
.pl-src-no { display: inline-block; width: 3.2rem; padding-right: .6rem; text-align: right; color: var(--muted);
  user-select: none; }
.pl-src-error { background: #fff; box-shadow: inset 3px 0 0 var(--ink); }
.pl-src-error .pl-src-text { text-decoration: underline wavy; text-underline-offset: 3px; }
.pl-src-error .pl-src-no { color: var(--ink); font-weight: 700; }
.pl-src-caret { display: block; padding-left: 3.2rem; margin-left: .6rem; font-weight: 700; }

.pl-editor { margin: .25rem 0 .5rem; }
.pl-editor-text { width: 100%; padding: .5rem .6rem; border: 1px solid var(--rule); background: #fff;
  color: var(--ink); line-height: 1.45; resize: vertical; tab-size: 2; }
.pl-editor-bar { display: flex; gap: .5rem; align-items: center; margin: .35rem 0; }
.pl-hint { font-size: 12px; color: var(--muted); }
.pl-button { font: 13px var(--sans); padding: .2rem .7rem; border: 1px solid var(--rule); background: #fff;
  color: var(--ink); border-radius: 3px; cursor: pointer; }
.pl-button:hover { border-color: var(--muted); }
.pl-primary { background: var(--accent); border-color: var(--accent); color: #fff; }
.pl-link { font: inherit; padding: 0; border: 0; background: none; color: var(--accent); cursor: pointer;
  text-decoration: underline; text-decoration-thickness: 1px; text-underline-offset: 2px; }
.pl-conflict { margin: .5rem 0; padding: .5rem .75rem; border: 1.5px solid var(--ink); background: #fff; }
.pl-conflict h4 { margin: 0 0 .3rem; font-size: 14px; }
.pl-conflict p { margin: 0 0 .4rem; font-size: 13.5px; }
.pl-conflict-sides { display: grid; grid-template-columns: 1fr 1fr; gap: .75rem; }
.pl-conflict-sides figure { margin: 0; min-width: 0; }
.pl-conflict-sides figcaption { font-size: 12px; font-weight: 600; color: var(--muted); }
.pl-conflict-sides pre { margin: .2rem 0; padding: .4rem .5rem; background: var(--wash); overflow-x: auto; }

.pl-add { display: flex; flex-wrap: wrap; gap: .6rem; align-items: baseline; margin: 1.5rem 0 .5rem;
  padding-top: .6rem; border-top: 1px dashed var(--rule); font-size: 13px; color: var(--muted); }
.pl-add select, .pl-add input { font: 13px var(--sans); }

.pl-rail { position: sticky; top: calc(var(--pl-top-h, 2.5rem) + 1rem); align-self: start;
  max-height: calc(100vh - var(--pl-top-h, 2.5rem) - 2rem); overflow-y: auto; font-size: 13px;
  background: var(--paper); min-width: 0; overflow-wrap: anywhere; }
.pl-rail-part { margin-bottom: 1.25rem; }
.pl-rail h2 { margin: 0 0 .35rem; font-size: 11.5px; letter-spacing: .08em; text-transform: uppercase;
  color: var(--muted); font-weight: 600; }
.pl-rail ul { margin: 0; padding: 0; list-style: none; }
.pl-rail li { margin: .15rem 0; }
.pl-ledger li { line-height: 1.4; }
.pl-failures { border-left: 3px solid var(--ink); padding-left: .5rem; }
.pl-failures h2 { color: var(--ink); }
.pl-outline a { text-decoration: none; color: var(--ink); }
.pl-outline a:hover { text-decoration: underline; }
.pl-outline-h { font-weight: 600; margin-top: .45rem !important; }
.pl-outline-h1 { display: none; }
.pl-outline-cell { padding-left: .6rem; font-family: var(--mono); font-size: 12px; }

/* Kind views: shared by the live page and the record. */
.plumb-table-source { overflow-wrap: anywhere; }
.plumb-sha { margin-left: .75em; color: var(--muted); font-size: 12px; }
/* A database's fingerprint on a line of its own under the engine and file, never split from its label. */
.plumb-table-fingerprint { display: block; margin-left: 0; }
.plumb-table-query { margin: .3rem 0; padding: .4rem .6rem; background: var(--wash); max-width: 100%;
  white-space: pre-wrap; overflow-wrap: anywhere; font-size: 12.5px; }
.pl-result table { border-collapse: collapse; font-size: 13px; font-variant-numeric: tabular-nums; margin: .35rem 0; }
.pl-result th, .pl-result td { padding: .15rem .7rem .15rem 0; text-align: right; border-bottom: 1px solid var(--wash); }
.pl-result thead th { font-weight: 600; color: var(--muted); border-bottom: 1px solid var(--rule); font-size: 12px; }
.pl-result th:first-child, .pl-result td:first-child { text-align: left; }
.pl-result p { margin: .3rem 0; }
.pl-result dl { display: grid; grid-template-columns: max-content 1fr; gap: 0 1rem; margin: .35rem 0;
  font-size: 13px; font-variant-numeric: tabular-nums; }
/* A phone: the terms get under half the width, so a long term wraps and its value stays on screen
   (after the rule above, which it overrides). */
@media (max-width: 40rem) { .pl-result dl { grid-template-columns: minmax(0, 45%) minmax(0, 1fr); } }
.pl-result dt { color: var(--muted); }
.pl-result dd { margin: 0; }
.pl-result h4 { margin: .5rem 0 .2rem; font-size: 13px; }
.pl-result ul { margin: .2rem 0; padding-left: 1.1rem; }
.pl-result details summary { cursor: pointer; color: var(--muted); font-size: 12px; }
/* calc: how prose names each value (quiet, beside it); data and what the code printed in a wash. */
.pl-result .plumb-calc-inline { text-align: left; padding-left: .9rem; color: var(--muted); }
.plumb-calc-inline code { font-size: 12px; }
.plumb-calc pre { margin: .35rem 0; padding: .45rem .65rem; background: var(--wash); max-width: 100%;
  max-height: 24rem; overflow: auto; line-height: 1.45; }
.plumb-calc-console { margin: .45rem 0 .2rem; }
.plumb-calc-console pre { white-space: pre-wrap; overflow-wrap: anywhere; }
.plumb-calc-note { font-size: 12.5px; }
/* fit computed in its database: where each number came from, set off by a rule at the left. */
.plumb-fit-engine { margin: .45rem 0; padding: .1rem 0 .1rem .6rem; border-left: 2px solid var(--rule);
  font-size: 13px; overflow-wrap: break-word; }
.pl-result .plumb-fit-engine p { margin: .2rem 0; }
.plumb-fit-engine h5 { margin: .5rem 0 .1rem; font-size: 12px; font-weight: 600; color: var(--muted); }
.plumb-fit-engine-passes { margin: .1rem 0; padding-left: 1.4rem; font-size: 12.5px; }
/* intervals by method: a compact table that scrolls on its own on a phone; traces folded. */
.plumb-fit-intervals { margin: .5rem 0; max-width: 100%; }
.plumb-fit-interval-scroll { max-width: 100%; overflow-x: auto; }
.plumb-fit-interval-table { border-collapse: collapse; font-size: 13px; font-variant-numeric: tabular-nums; }
.plumb-fit-interval-table caption { text-align: left; font-weight: 600; font-size: 12.5px; color: var(--muted); padding-bottom: .2rem; }
.plumb-fit-interval-basis { font-weight: 400; }
.plumb-fit-interval-table th, .plumb-fit-interval-table td { padding: .15rem .6rem .15rem 0; text-align: left; white-space: nowrap; vertical-align: top; }
.plumb-fit-interval-table thead th { border-bottom: 1px solid var(--rule); font-weight: 600; font-size: 12px; }
.plumb-fit-derived { white-space: normal; font-weight: 400; }
.plumb-fit-censored { margin: .45rem 0; padding: .1rem 0 .1rem .6rem; border-left: 2px solid var(--rule); font-size: 13px; }
.pl-result .plumb-fit-censored p { margin: .2rem 0; }
.pl-result .plumb-fit-censored p.plumb-fit-censored-caption { margin: .45rem 0 .1rem; font-weight: 600; font-size: 12.5px; color: var(--muted); }
.plumb-fit-interval-mc { margin: .2rem 0; font-size: 12.5px; color: var(--muted); }
.plumb-fit-interval-notes { margin: .2rem 0; padding-left: 1.4rem; font-size: 12.5px; color: var(--muted); }
.plumb-fit-traces summary { cursor: pointer; font-size: 13px; }
.plumb-fit-traces-key { font-size: 12.5px; color: var(--muted); margin: .2rem 0; }
.plumb-fit-trace-grid { display: flex; flex-wrap: wrap; gap: .6rem; }
.plumb-fit-traces .plumb-fit-trace { margin: 0; flex: 0 1 220px; width: 220px; max-width: 100%; }
.pl-result .plumb-fit-traces .plumb-fit-trace svg { width: 100%; min-width: 0; height: auto; display: block; }
.plumb-fit-trace figcaption { text-align: center; font-size: 12.5px; }
.plumb-trace-axis { stroke: var(--rule); }
.plumb-trace-level { stroke: var(--muted); stroke-dasharray: 4 3; }
.plumb-trace-line { fill: none; stroke: var(--accent); stroke-width: 1.5; }
.plumb-trace-point { fill: var(--accent); }
.plumb-trace-tick { font-size: 10px; fill: var(--muted); }

${PRINT_STYLE}
`;
