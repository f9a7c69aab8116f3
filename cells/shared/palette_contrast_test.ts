/**
 * The fit palette against white paper: WCAG 2.1 relative luminance and
 * contrast ratio (W3C, Web Content Accessibility Guidelines 2.1, definitions
 * "relative luminance" and "contrast ratio"; success criterion 1.4.11 asks
 * 3:1 for graphical objects).
 */
import { ok } from "node:assert/strict";
import { FAINT_INK, FIT_PALETTE, FLAG_INK, INK } from "./palette.ts";

function luminance(hex: string): number {
  const c = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16) / 255)
    .map((v) => v <= 0.03928 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4);
  return 0.2126 * c[0] + 0.7152 * c[1] + 0.0722 * c[2];
}

function contrastOnWhite(hex: string): number {
  return 1.05 / (luminance(hex) + 0.05);
}

Deno.test("FIT_PALETTE colours, INK and FLAG_INK stand 3:1 against white (WCAG 2.1 SC 1.4.11)", () => {
  for (const c of [...FIT_PALETTE, INK, FLAG_INK]) {
    ok(contrastOnWhite(c) >= 3, `${c}: ${contrastOnWhite(c).toFixed(2)}`);
  }
  ok(contrastOnWhite(FAINT_INK) < 1.6, "grid lines stay faint");
});

/** CIELAB of an sRGB colour, D65 white (CIE 15:2004 and IEC 61966-2-1; constants from memory). */
function lab(hex: string): [number, number, number] {
  const c = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16) / 255)
    .map((v) => v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4);
  const x = (0.4124 * c[0] + 0.3576 * c[1] + 0.1805 * c[2]) / 0.95047;
  const y = 0.2126 * c[0] + 0.7152 * c[1] + 0.0722 * c[2];
  const z = (0.0193 * c[0] + 0.1192 * c[1] + 0.9505 * c[2]) / 1.08883;
  const f = (t: number) => t > (6 / 29) ** 3 ? Math.cbrt(t) : t / (3 * (6 / 29) ** 2) + 4 / 29;
  return [116 * f(y) - 16, 500 * (f(x) - f(y)), 200 * (f(y) - f(z))];
}

Deno.test("FIT_PALETTE colours are far apart from each other and from INK (ours: CIE76 ΔE ≥ 20)", () => {
  const all = [...FIT_PALETTE, INK];
  for (let i = 0; i < all.length; i++) {
    for (let j = i + 1; j < all.length; j++) {
      const a = lab(all[i]), b = lab(all[j]);
      const d = Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
      ok(d >= 20, `${all[i]} and ${all[j]}: ΔE ${d.toFixed(1)}`);
    }
  }
});
