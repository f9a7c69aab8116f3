/**
 * The robust part of the fit view: the loss and its tuning constant, the
 * robust scale, the covariance's form, and the rows the loss down-weighted
 * with their weights. Plain markup (live page and record alike).
 *
 * @module
 */
import type { VNode } from "preact";
import type { RobustResult } from "./_robust_result.ts";
import { formatNumber, withUnit } from "../shared/format.ts";

/**
 * Renders the robust fit's section.
 *
 * @param props The robust result and the response's unit.
 * @returns The section.
 * @example
 * ```ts
 * import { renderToString } from "preact-render-to-string";
 * import { RobustSection } from "./_robust_view.tsx";
 * const html = renderToString(RobustSection({ unit: null, b: {
 *   loss: "huber", loss_name: "Huber", tuning: 1.345, scale: 2.44, scale_method: "MAD",
 *   covariance_form: "sandwich", covariance_statement: "sandwich", correction_factor: 1.03,
 *   iterations: 21, start: "the least-squares fit", down_weighted_rule: "|r|/s above 1.345",
 *   down_weighted: [{ row: 21, weight: 0.37, scaled_residual: -3.7 }] } }));
 * if (!html.includes("Huber") || !html.includes("21")) throw new Error(html);
 * ```
 */
export function RobustSection(props: { b: RobustResult; unit: string | null }): VNode {
  const { b } = props;
  const k = b.down_weighted.length;
  return (
    <section class="plumb-fit-robust" aria-label="Robust fit">
      <p>
        Robust fit: {b.loss_name} loss, tuning constant c = {b.tuning}, scale s ={" "}
        {withUnit(formatNumber(b.scale, 4), props.unit)}{" "}
        (the residuals' median absolute deviation over 0.6745, re-estimated at each of{" "}
        {b.iterations} reweighted fits from {b.start}). Standard uncertainties come from the{" "}
        {b.covariance_form === "sandwich" ? "sandwich" : "scaled"} covariance:{" "}
        {b.covariance_statement}. Profile and bootstrap intervals, the likelihood and the criteria
        belong to least squares and are not given.
      </p>
      <p>
        {k === 0
          ? `No row lies beyond c·s: none was down-weighted.`
          : `${k} ${k === 1 ? "row lies" : "rows lie"} beyond c·s and ${
            k === 1 ? "was" : "were"
          } down-weighted:`}
      </p>
      {k > 0 && (
        <table class="plumb-fit-robust-rows">
          <thead>
            <tr>
              <th scope="col">Row</th>
              <th scope="col">Residual / s</th>
              <th scope="col">Weight</th>
            </tr>
          </thead>
          <tbody>
            {b.down_weighted.map((d) => (
              <tr key={d.row}>
                <th scope="row">{d.row}</th>
                <td>{formatNumber(d.scaled_residual, 3)}</td>
                <td>{formatNumber(d.weight, 3)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
