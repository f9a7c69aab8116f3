/**
 * The part of the fit view for a response with rows below a detection limit
 * (RUN-JSON `censoring`, _censored_fit.ts): how many rows, how they were
 * fitted, and a table of what substituting a fraction of the limit gives
 * beside the maximum-likelihood estimates, each shift in standard errors.
 * Plain markup for the page and the record.
 *
 * ```
 *  5 of 12 rows lie below their detection limit (cells of nitrate written <L): maximum
 *  likelihood, censored normal; σ = 0.19
 *  Substituting instead          a              b
 *    maximum likelihood          4.66           −0.481
 *    0                           3.98 (−4.5 u)  −0.330 (+5.0 u)
 *    L/2 …
 * ```
 *
 * @module
 */
import type { VNode } from "preact";
import type { CensoringRecord } from "./_censored_fit.ts";
import { formatNumber } from "../shared/format.ts";

/**
 * The censoring part of a fit's view.
 *
 * @param props The record, the parameter names, rows in the fit.
 * @returns The part.
 */
const CAPTION = "What substituting the limit gives instead (shift in ML standard errors)";

export function CensoredSection(
  { c, parameters, n }: { c: CensoringRecord; parameters: string[]; n: number },
): VNode {
  const substituted = c.method === "substitution";
  return (
    <div class="plumb-fit-censored">
      <p class="plumb-fit-censored-line">
        {c.rows_below} of {n} rows lie below their detection limit ({c.flags_from}): {substituted
          ? (
            <strong>
              given{" "}
              {formatNumber(c.substitute, 4)}·L and fitted as if measured (substitution); maximum
              likelihood is shown beside it
            </strong>
          )
          : <>maximum likelihood, censored normal; σ = {formatNumber(c.sigma, 4)}</>}
      </p>
      <p class="plumb-fit-censored-caption">{CAPTION}</p>
      <div class="plumb-fit-interval-scroll">
        <table class="plumb-fit-interval-table" aria-label={CAPTION}>
          <thead>
            <tr>
              <th scope="col">Rows below the limit set to</th>
              {parameters.map((p) => (
                <th scope="col" key={p}>
                  <code>{p}</code>
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            <tr>
              <th scope="row">maximum likelihood</th>
              {c.ml_estimates.map((v, j) => <td key={j}>{formatNumber(v, 4)}</td>)}
            </tr>
            {c.substitutions.map((s) => (
              <tr key={s.label}>
                <th scope="row">{s.label}</th>
                {s.estimates.map((v, j) => (
                  <td key={j}>
                    {formatNumber(v, 4)}
                    {s.shift[j] !== null && ` (${signed(s.shift[j]!)} u)`}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}

function signed(v: number): string {
  const t = formatNumber(Math.abs(v), 2);
  return v < 0 ? `−${t}` : `+${t}`;
}
