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
 * Colours: the colour-blind-safe set of Okabe & Ito, "Color Universal
 * Design" (2008), with its yellow (#F0E442) darkened to #9A7D00 for contrast
 * on white paper (our change).
 *
 * FNV-1a: Fowler, Noll & Vo, offset basis 2166136261, prime 16777619
 * (IETF draft "The FNV Non-Cryptographic Hash Algorithm"; constants from memory).
 *
 * @module
 */

/** Eight colour-blind-safe curve colours, in slot order. */
export const FIT_PALETTE: readonly string[] = [
  "#0072B2", // blue
  "#D55E00", // vermillion
  "#009E73", // bluish green
  "#CC79A7", // reddish purple
  "#E69F00", // orange
  "#56B4E9", // sky blue
  "#9A7D00", // dark yellow
  "#000000", // black
];

/** Ink for data points and reference lines: neutral, never a fit colour. */
export const INK = "#555555";

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
