/**
 * End labels that never overlap: a one-dimensional layout of labels along
 * an axis. Each label wants a position (the end of its curve); labels closer
 * than a minimum gap are grouped, and each group is centred on the mean of
 * the positions its labels want, spaced by the gap and kept inside the
 * panel. Groups that then touch are merged and centred again, until none
 * overlap (at most n − 1 merges).
 *
 * ```
 *  wanted  ─a─b────c          placed  a
 *                                     b      (a, b one group, centred on their mean)
 *                                     ────c
 * ```
 *
 * Our own layout (common practice for line labels, no source); the order of
 * the labels along the axis is kept, so a label stays beside its curve.
 *
 * @module
 */

/**
 * Positions for labels so that any two are at least `gap` apart.
 *
 * @param wanted The position each label wants (px, any order).
 * @param gap The least distance between two labels (px).
 * @param lo The smallest position allowed.
 * @param hi The largest position allowed.
 * @returns One position per label, in the order given.
 * @example
 * ```ts
 * import { spreadLabels } from "./_labels.ts";
 * const y = spreadLabels([100, 102, 300], 12, 0, 400);
 * if (y[1] - y[0] < 12 || y[2] !== 300) throw new Error(String(y));
 * ```
 */
export function spreadLabels(wanted: number[], gap: number, lo: number, hi: number): number[] {
  const order = wanted.map((_, i) => i).sort((a, b) => wanted[a] - wanted[b] || a - b);
  const groups: { members: number[]; top: number }[] = [];
  for (const i of order) {
    groups.push({ members: [i], top: place([i], wanted, gap, lo, hi) });
    // Merge backwards while the last group overlaps the one before it.
    while (groups.length > 1) {
      const b = groups[groups.length - 1], a = groups[groups.length - 2];
      if (a.top + a.members.length * gap <= b.top + 1e-9) break;
      groups.splice(-2, 2, {
        members: [...a.members, ...b.members],
        top: place([...a.members, ...b.members], wanted, gap, lo, hi),
      });
    }
  }
  const out = new Array<number>(wanted.length);
  for (const g of groups) g.members.forEach((m, k) => (out[m] = g.top + k * gap));
  return out;
}

/** The first position of a group centred on its labels' mean wish, kept within [lo, hi]. */
function place(members: number[], wanted: number[], gap: number, lo: number, hi: number): number {
  const mean = members.reduce((s, m) => s + wanted[m], 0) / members.length;
  const span = (members.length - 1) * gap;
  const top = mean - span / 2;
  // When the group is taller than the panel, it starts at lo and runs past hi.
  return Math.max(lo, Math.min(top, hi - span));
}
