/**
 * The verdict of a method comparison in plain words: a constant difference
 * when the intercept's interval excludes 0, a proportional one when the
 * slope's excludes 1, at the document's confidence level, by Deming's and by
 * Passing–Bablok's intervals; said together when they agree and apart when
 * they do not. "No difference shown" is never "no difference": the sentence
 * says what these data exclude, and the limits of agreement say how far one
 * reading may stray.
 *
 * @module
 */
import type { Agreement } from "./agreement.ts";
import type { AgreementVerdict } from "./result.ts";
import { formatIntervalAt, formatNumber } from "../shared/format.ts";

const excludes = (lo: number | null, hi: number | null, v: number): boolean | null =>
  lo === null || hi === null ? null : lo > v || hi < v;

/** `1.010 … 1.049`, to the place a standard error of a quarter of the width would give. */
const range = (lo: number | null, hi: number | null) =>
  formatIntervalAt(
    [lo, hi],
    lo !== null && hi !== null && hi > lo ? (hi - lo) / 4 : null,
    lo !== null && hi !== null ? (lo + hi) / 2 : null,
    { open: "", sep: " … ", close: "" },
  ).replaceAll("—", "open");

/**
 * The verdict.
 *
 * @param out The comparison.
 * @returns Per question, each regression's answer, and one sentence.
 */
export function verdictOf(out: Agreement): AgreementVerdict {
  const d = out.deming, pb = out.passingBablok, level = out.level;
  const constant = {
    deming: excludes(...d.interceptCi, 0)!,
    passing_bablok: excludes(...pb.interceptCi, 0),
  };
  const proportional = {
    deming: excludes(...d.slopeCi, 1)!,
    passing_bablok: excludes(...pb.slopeCi, 1),
  };
  const linear = pb.cusum === null ? null : pb.cusum.linear;
  const pct = `${formatNumber(100 * level, 4)}%`;
  const parts = [
    phrase(
      "constant",
      constant,
      `intercept ${range(...d.interceptCi)} by Deming, ${
        range(...pb.interceptCi)
      } by Passing–Bablok, against 0`,
    ),
    phrase(
      "proportional",
      proportional,
      `slope ${range(...d.slopeCi)} by Deming, ${
        range(...pb.slopeCi)
      } by Passing–Bablok, against 1`,
    ),
  ];
  let sentence = `At the ${pct} level: ${parts.join("; ")}`;
  if (linear === false) {
    sentence +=
      `. The cusum test rejects a straight line between the methods, so neither line describes their relation well`;
  }
  return { level, constant, proportional, linear, sentence };
}

function phrase(
  what: "constant" | "proportional",
  v: { deming: boolean; passing_bablok: boolean | null },
  evidence: string,
): string {
  const name = `${what} difference`;
  if (v.passing_bablok === null) {
    return `${
      v.deming ? `a ${name}` : `no ${name} shown`
    } by Deming; Passing–Bablok's interval is open (${evidence})`;
  }
  if (v.deming && v.passing_bablok) return `a ${name} (${evidence})`;
  if (!v.deming && !v.passing_bablok) return `no ${name} shown (${evidence})`;
  return `a ${name} by ${v.deming ? "Deming" : "Passing–Bablok"} only, not by ${
    v.deming ? "Passing–Bablok" : "Deming"
  } (${evidence})`;
}
