/**
 * The live page's print rules (part of ui/style.ts's sheet, which the static
 * record also carries before its own rules). A printed page is a dated
 * report: the date of printing under the title (`.pl-printed`, filled by
 * ui/top_bar.tsx), page numbers in the page margin (CSS Paged Media Level 3
 * margin boxes), no live-only text (elapsed times, "changed 1 min ago", the
 * connection, the undo notice, edit controls: every element marked
 * `.pl-live-only` and the controls below), and no heading left alone at the
 * foot of a page.
 *
 * @module
 */

/** The print rules. */
export const PRINT_STYLE = `
@page { margin: 16mm 14mm;
  @bottom-right { content: "page " counter(page) " of " counter(pages); font: 9pt var(--sans); } }
@media print {
  html { background: #fff; }
  body { font-size: 10.5pt; }
  .pl-top { position: static; border-bottom: 1px solid #999; padding: 0 0 .3rem; }
  .pl-printed { display: block; flex-basis: 100%; margin: .1rem 0 0; font-size: 9pt; color: var(--ink); }
  .pl-body { display: block; padding: 0; }
  .pl-live-only, .pl-rail, .pl-cell-actions, .pl-add, .pl-editor, .pl-progress, .pl-progress-note,
    .pl-undo, .pl-top-tools { display: none !important; }
  .pl-cell { break-inside: avoid-page; content-visibility: visible; }
  h1, h2, h3, h4, .pl-cell-head, .pl-earlier > summary { break-after: avoid-page; }
  h1 + *, h2 + *, h3 + *, h4 + * { break-before: avoid-page; }
  p { orphans: 3; widows: 3; }
  .pl-stale { opacity: 1; }
  .pl-prose-source { max-height: none; }
  .pl-result table { display: table; width: auto; max-width: none; overflow: visible; background: none; }
  .pl-result td { white-space: normal; }
  .pl-result figure { overflow: visible; }
  .pl-result figure svg { min-width: 0 !important; }
  a { color: inherit; }
}
`;
