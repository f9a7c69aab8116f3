/**
 * Inner loops of the double-double least-squares path over parallel hi/lo
 * Float64Arrays, written out with the error-free transformations inline so
 * the loops allocate nothing.
 *
 * Methods: TwoSum (Knuth), TwoProduct by Veltkamp splitting (Dekker 1971);
 * the dot product accumulates the exact errors of every product and sum in a
 * second double, as Dot2 of Ogita, Rump & Oishi 2005 ("Accurate sum and dot
 * product", SIAM J. Sci. Comput. 26), with double-double operands: the result
 * is as accurate as if computed in twice the working precision and then
 * rounded, here about 2^−104 relative to Σ|xᵢyᵢ|.
 *
 * @module
 */

const SPLITTER = 134217729; // 2^27 + 1

/** Result slot of the kernels: `[hi, lo]`. */
export const OUT = new Float64Array(2);

/** Error of the product p = fl(a·b): a·b = p + e exactly (|a|, |b| ≤ 2^996). */
export function productError(a: number, b: number, p: number): number {
  let c = SPLITTER * a;
  const ah = c - (c - a), al = a - ah;
  c = SPLITTER * b;
  const bh = c - (c - b), bl = b - bh;
  return ((ah * bh - p) + ah * bl + al * bh) + al * bl;
}

/**
 * OUT = s + Σ x[xo+i]·y[yo+i] for i < len, all values hi + lo.
 * (s is passed as sh, sl so the leading 1 of a Householder vector is cheap.)
 */
export function dot(
  sh: number,
  sl: number,
  xh: Float64Array,
  xl: Float64Array,
  xo: number,
  yh: Float64Array,
  yl: Float64Array,
  yo: number,
  len: number,
): void {
  let h = sh, l = sl;
  for (let i = 0; i < len; i++) {
    const a = xh[xo + i], b = yh[yo + i];
    const p = a * b;
    const pe = productError(a, b, p) + (a * yl[yo + i] + xl[xo + i] * b);
    const s = h + p;
    const v = s - h;
    l += ((h - (s - v)) + (p - v)) + pe;
    h = s;
  }
  const s = h + l;
  OUT[0] = s;
  OUT[1] = l - (s - h);
}

/** y[yo+i] −= a·x[xo+i] for i < len (a = ah + al). */
export function axpy(
  ah: number,
  al: number,
  xh: Float64Array,
  xl: Float64Array,
  xo: number,
  yh: Float64Array,
  yl: Float64Array,
  yo: number,
  len: number,
): void {
  for (let i = 0; i < len; i++) {
    const b = xh[xo + i];
    const p = ah * b;
    const pe = productError(ah, b, p) + (ah * xl[xo + i] + al * b);
    const c = yh[yo + i];
    const s = c - p;
    const v = s - c;
    const e = ((c - (s - v)) + (-p - v)) + (yl[yo + i] - pe);
    const t = s + e;
    yh[yo + i] = t;
    yl[yo + i] = e - (t - s);
  }
}

/** OUT = a·b. */
export function mul(ah: number, al: number, bh: number, bl: number): void {
  const p = ah * bh;
  const e = productError(ah, bh, p) + (ah * bl + al * bh);
  const s = p + e;
  OUT[0] = s;
  OUT[1] = e - (s - p);
}

/** OUT = a + b (accurate form). */
export function add(ah: number, al: number, bh: number, bl: number): void {
  let s = ah + bh, v = s - ah;
  const e = (ah - (s - v)) + (bh - v);
  let t = al + bl;
  v = t - al;
  const f = (al - (t - v)) + (bl - v);
  const s1 = s + (e + t), e1 = (e + t) - (s1 - s);
  s = s1 + (e1 + f);
  t = (e1 + f) - (s - s1);
  OUT[0] = s;
  OUT[1] = t;
}

/** OUT = a/b (three partial quotients, as QD's dd_real accurate division). */
export function div(ah: number, al: number, bh: number, bl: number): void {
  const q1 = ah / bh;
  mul(bh, bl, q1, 0);
  add(ah, al, -OUT[0], -OUT[1]);
  const rh = OUT[0], rl = OUT[1];
  const q2 = rh / bh;
  mul(bh, bl, q2, 0);
  add(rh, rl, -OUT[0], -OUT[1]);
  const q3 = OUT[0] / bh;
  const s = q1 + q2;
  add(s, q2 - (s - q1), q3, 0);
}

/** OUT = √a for a > 0 (one Newton step from 1/√hi, QD's dd_real sqrt). */
export function sqrt(ah: number, al: number): void {
  const x = 1 / Math.sqrt(ah);
  const ax = ah * x;
  add(ah, al, -(ax * ax), -productError(ax, ax, ax * ax));
  const d = OUT[0] * x * 0.5;
  const s = ax + d;
  OUT[0] = s;
  OUT[1] = d - (s - ax);
}
