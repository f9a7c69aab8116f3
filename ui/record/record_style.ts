/**
 * The record's own style, added after the page's (ui/style.ts, which styles
 * the kinds' views): a reading column, the banner and caution, provenance,
 * and print rules for A4 and Letter (no cell split where avoidable, wide
 * tables scaled to the page, charts keeping their aspect, a running header
 * with the title and page numbers by CSS page-margin boxes; CSS Paged Media
 * Module Level 3, W3C).
 *
 * @module
 */

/**
 * The record's CSS.
 *
 * @param title The document's title, for the running header (quoted for CSS).
 * @param paper A paper size to print on (`@page size`), or none: the printer's.
 * @returns A style sheet.
 */
export function recordStyle(title: string, paper?: "a4" | "letter"): string {
  const quoted = JSON.stringify(title.slice(0, 120)).replace(/</g, "\\3c ");
  return `
body.pl-record { max-width: 58rem; margin: 0 auto; padding: 1.5rem 1.25rem 4rem; }
.pl-record-head h1 { margin: 0 0 .25rem; }
.pl-record-head p { margin: .2rem 0; color: #4a5560; }
.pl-record-banner { border: 2px solid #9b2c2c; padding: .6rem .9rem; margin: 1rem 0; }
.pl-record-banner h2 { font-size: 1rem; margin: 0 0 .3rem; color: #9b2c2c; }
.pl-record-caution { border-left: 4px solid #8a6d1d; padding: .4rem .9rem; margin: 1rem 0;
  background: #fbf7ea; }
.pl-record-state { margin-left: auto; font-size: .85rem; color: #4a5560; }
.pl-record-source { font-size: .8rem; background: #f4f5f6; padding: .4rem .6rem; margin: .4rem 0;
  white-space: pre-wrap; overflow-wrap: anywhere; }
.pl-record-provenance th { text-align: left; vertical-align: top; padding-right: 1rem;
  white-space: nowrap; }
.pl-hash { font-size: .8rem; overflow-wrap: anywhere; }
.pl-result { overflow-x: auto; }
.pl-result svg { max-width: 100%; height: auto; }
@page { margin: 18mm 14mm;${paper ? ` size: ${paper === "a4" ? "A4" : "letter"};` : ""}
  @top-center { content: ${quoted}; font-size: 9pt; color: #4a5560; }
  @bottom-right { content: counter(page) " / " counter(pages); font-size: 9pt; } }
@media print {
  body.pl-record { max-width: none; padding: 0; }
  .pl-cell, figure, table, .pl-record-banner, .pl-record-caution { break-inside: avoid; }
  h1, h2, h3, .pl-cell-head { break-after: avoid; }
  .pl-result { overflow: visible; }
  .pl-result table { font-size: 8pt; }
  a { color: inherit; text-decoration: none; }
}
`;
}
