/**
 * The fit colour palette: the same colour for the same fit everywhere in a
 * document (charts of the `chart` cell, the residual charts of `check`, the
 * compare view), in the browser and in the static record.
 *
 * Rule: a fit's colour is `FIT_PALETTE[fnv1a(name) % 8]`, the 32-bit FNV-1a
 * hash of the fit's name (its UTF-8 bytes). It depends on the name only, so
 * every cell and every view agrees without knowing the rest of the document,
 * and renaming a fit is the only thing that changes its colour. Two fits can
 * share a colour (eight slots); charts therefore also label each curve by
 * name at its end, so colour never carries meaning alone (DESIGN.md §7a).
 *
 * Colours: our own eight, built on the hues of Okabe & Ito's colour-blind-
 * safe set ("Color Universal Design", 2008) and darkened where needed so
 * that every curve stands at least 3:1 against white paper (WCAG 2.1,
 * success criterion 1.4.11, non-text contrast; tested in
 * palette_contrast_test.ts) and at least ΔE 20 (CIE76) from each other and
 * from the data's ink, with no black, so a curve never reads as an axis or
 * as data. Data are drawn in {@link INK} as open rings,
 * flagged rows in {@link FLAG_INK}.
 *
 * FNV-1a: Fowler, Noll & Vo, offset basis 2166136261, prime 16777619
 * (IETF draft "The FNV Non-Cryptographic Hash Algorithm"; constants from memory).
 *
 * @module
 */

/** Eight colour-blind-safe curve colours, in slot order. */
export const FIT_PALETTE: readonly string[] = [
  "#0072B2", // blue
  "#C4520A", // burnt vermillion
  "#00876A", // deep bluish green
  "#B04F8C", // plum
  "#A86F00", // ochre
  "#6358C4", // slate violet
  "#5C7A1F", // moss
  "#7A3E2B", // umber
];

/** Ink for data points and reference lines: neutral, never a fit colour. */
export const INK = "#555555";

/** Ink for rows a check flags (its findings' rows) and the thresholds they cross. */
export const FLAG_INK = "#8A1C1C";

/** Ink for grid lines and secondary rules. */
export const FAINT_INK = "#D4D4D4";

/**
 * 32-bit FNV-1a hash of a string's UTF-8 bytes.
 *
 * @param text Any string.
 * @returns An unsigned 32-bit integer.
 * @example
 * ```ts
 * import { fnv1a } from "./palette.ts";
 * // The FNV-1a hash of the empty string is the offset basis (from memory).
 * if (fnv1a("") !== 2166136261) throw new Error("offset basis");
 * ```
 */
export function fnv1a(text: string): number {
  let h = 0x811c9dc5;
  for (const byte of new TextEncoder().encode(text)) {
    h ^= byte;
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h >>> 0;
}

/**
 * The colour of a fit, from its name alone.
 *
 * @param fitName The fit cell's name.
 * @returns A hex colour from {@link FIT_PALETTE}.
 * @example
 * ```ts
 * import { fitColor, FIT_PALETTE } from "./palette.ts";
 * if (fitColor("root") !== fitColor("root")) throw new Error("deterministic");
 * if (!FIT_PALETTE.includes(fitColor("line"))) throw new Error("from the palette");
 * ```
 */
export function fitColor(fitName: string): string {
  return FIT_PALETTE[fnv1a(fitName) % FIT_PALETTE.length];
}
