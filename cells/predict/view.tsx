/**
 * The predict cell's view: a table of points (predictor values, estimate,
 * standard error, interval for the mean response, interval for a new
 * observation) and a table of inverse predictions (response value, the x
 * that gives it, its interval and the method). Plain markup, shared by the
 * live page and the static record.
 *
 * @module
 */
import type { VNode } from "preact";
import type { PageFace, ViewProps } from "../../kernel/contract/mod.ts";
import type { PredictResult } from "./result.ts";
import { formatInterval, formatNumber } from "../shared/format.ts";

/**
 * Renders a predict result.
 *
 * @param props The cell name and its summary.
 * @returns The block's content.
 * @example
 * ```ts
 * import { renderToString } from "preact-render-to-string";
 * import { PredictView } from "./view.tsx";
 * const html = renderToString(PredictView({ name: "eol", result: {
 *   fit: "line", level: 0.95, response: "y", scale: "response as written",
 *   se_scale: "response as written", distribution: "t(8)", new_observation: "s²/m",
 *   mean_method: "exact",
 *   at: [{ x: { x: 2 }, estimate: 5, se_fit: 0.1, ci: [4.8, 5.2], pi: [4, 6], extrapolated: false }],
 *   solve: [{ y: { y: 5 }, x: { x: 2 }, ci: [1.5, 2.5], method: "fieller",
 *     interval_for: "a new single observation of the response", extrapolated: false }],
 * } }));
 * if (!html.includes("fieller")) throw new Error(html);
 * ```
 */
export function PredictView({ name, result: r }: ViewProps<PredictResult>): VNode {
  const level = `${formatNumber(100 * r.level, 4)}%`;
  const columns = r.at.length > 0 ? Object.keys(r.at[0].x) : [];
  return (
    <section class="plumb-predict" aria-label={`Predictions ${name}`}>
      <p class="plumb-predict-basis">
        From fit <code>{r.fit}</code>, response <code>{r.response}</code> on the {r.scale}{" "}
        scale; intervals at {level} from {r.distribution}; a new observation's variance:{" "}
        {r.new_observation}.
      </p>
      {r.at.length > 0 && (
        <table class="plumb-predict-points">
          <thead>
            <tr>
              {columns.map((c) => <th scope="col" key={c}>{c}</th>)}
              <th scope="col">Estimate</th>
              <th scope="col">Std. error ({r.se_scale})</th>
              <th scope="col">{level} mean response</th>
              <th scope="col">{level} new observation</th>
            </tr>
          </thead>
          <tbody>
            {r.at.map((p, i) => (
              <tr key={i}>
                {columns.map((c) => (
                  <td key={c}>
                    {formatNumber(p.x[c], 6)}
                    {p.extrapolated ? " (extrapolated)" : ""}
                  </td>
                ))}
                <td>{formatNumber(p.estimate, 6)}</td>
                <td>{formatNumber(p.se_fit, 3)}</td>
                <td>{formatInterval(p.ci)}</td>
                <td>{formatInterval(p.pi)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {r.solve.length > 0 && (
        <table class="plumb-predict-solve">
          <thead>
            <tr>
              <th scope="col">Response</th>
              <th scope="col">Solved for</th>
              <th scope="col">{level} interval</th>
              <th scope="col">Method</th>
            </tr>
          </thead>
          <tbody>
            {r.solve.map((s, i) => (
              <tr key={i}>
                <td>{entries(s.y)}</td>
                <td>{entries(s.x)}{s.extrapolated ? " (extrapolated)" : ""}</td>
                <td>{formatInterval(s.ci)}</td>
                <td>{s.method}, for {s.interval_for}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}

function entries(v: Record<string, number>): string {
  return Object.entries(v).map(([k, x]) => `${k} = ${formatNumber(x, 6)}`).join(", ");
}

/** The `predict` kind's page face: its view, for the live page and the record. */
export const predictPage: PageFace<PredictResult, VNode> = { kind: "predict", view: PredictView };
