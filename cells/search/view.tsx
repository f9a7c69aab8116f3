/**
 * The search cell's view: a sentence on the best model, a chart of the best
 * criterion against the number of candidates, the best models overall and
 * per size with their criterion, and notes on how they were ranked. On the
 * live page every listed model has a button that adds a `fit` cell of it
 * below the search (`add_fit.ts`); the static record, which runs no
 * scripts, shows the tables without it.
 *
 * @module
 */
import type { VNode } from "preact";
import { useState } from "preact/hooks";
import type { PageFace, ViewProps } from "../../kernel/contract/mod.ts";
import { DrawnFigure } from "../../ui/charts/mod.ts";
import { distinctTexts, formatNearOne, formatNumber } from "../shared/format.ts";
import type { SearchModel, SearchResult } from "./result.ts";
import { renderCriterionChart } from "./criterion_chart.ts";
import { addFitCell, fitBody } from "./add_fit.ts";

/** True in a browser page, false on the server (the record) and in tests. */
const LIVE = typeof globalThis.document !== "undefined" &&
  typeof globalThis.requestAnimationFrame === "function";

/**
 * Renders a search result.
 *
 * @param props The cell name and its summary.
 * @returns The block's content.
 * @example
 * ```ts
 * import { h } from "preact";
 * import { renderToString } from "preact-render-to-string";
 * import { SearchView } from "./view.tsx";
 * const html = renderToString(h(SearchView, { name: "s", result: {
 *   on: "t", response: "y", response_unit: null, by: "bic", criterion: "BIC",
 *   larger_is_better: false, candidates: ["x"], always: [], intercept: true, n: 3, keep: 5,
 *   largest: 1, subsets_evaluated: 2, aliased: 0, aliased_examples: [], exact: true,
 *   k_convention: "k = p + 1", count_variance: true, best: [], sizes: [], method: "By sweeps",
 *   loo_given: true,
 * } as never }));
 * if (!html.includes("No subset could be ranked")) throw new Error(html);
 * ```
 */
export function SearchView({ name, result: r }: ViewProps<SearchResult>): VNode {
  const [status, setStatus] = useState<string | null>(null);
  const add = LIVE
    ? (m: SearchModel, button: HTMLElement) => {
      setStatus(`Adding a fit of ${modelWords(m)}…`);
      addFitCell(button, name, fitBody(r, m)).then(setStatus);
    }
    : null;
  return (
    <section class="plumb-search" aria-label={`Search ${name}`}>
      <p class="plumb-search-verdict">{verdict(r)}</p>
      {r.best.length > 0 && <DrawnFigure draw={(d) => renderCriterionChart(r, d)} data={r} />}
      {r.best.length > 0 && (
        <ModelTable result={r} caption="Best overall" rows={r.best.map((m) => ({ m }))} add={add} />
      )}
      {r.sizes.some((s) => s.best.length > 0) && (
        <ModelTable
          result={r}
          caption="Best by number of candidates"
          rows={r.sizes.flatMap((s) => s.best.map((m, i) => ({ m, size: i === 0 ? s : null })))}
          add={add}
        />
      )}
      <ul class="plumb-search-notes">
        <li>{r.method}.</li>
        <li>{heldByAll(r)}</li>
        <li>Parameters counted by the criteria: {r.k_convention}.</li>
        {r.aliased > 0 && <li>{aliasedNote(r)}</li>}
        {r.sizes.some((s) => !s.exact) && <li>{inexactNote(r)}</li>}
      </ul>
      {status !== null && <p class="plumb-search-status pl-live-only" role="status">{status}</p>}
    </section>
  );
}

interface Row {
  m: SearchModel;
  /** Set on the first row of a size (the per-size table). */
  size?: { size: number; subsets: number; aliased: number } | null;
}

function ModelTable(props: {
  result: SearchResult;
  caption: string;
  rows: Row[];
  add: ((m: SearchModel, button: HTMLElement) => void) | null;
}): VNode {
  const { result: r, rows, add } = props;
  const bySize = rows.some((x) => x.size !== undefined);
  const texts = columnTexts(r, rows.map((x) => x.m));
  const heads = [
    ...(bySize ? ["Size"] : ["Rank"]),
    "Candidates chosen",
    "k",
    r.criterion,
    `Δ ${r.criterion}`,
    ...(r.by === "adj_r2" ? [] : ["adjusted R²"]),
    ...(r.by === "loo" || !r.loo_given ? [] : ["LOO RMSE"]),
  ];
  return (
    <table class="plumb-search-models">
      <caption>{props.caption}</caption>
      <thead>
        <tr>
          {heads.map((h) => <th scope="col" key={h}>{h}</th>)}
          {add && <th scope="col">Fit</th>}
        </tr>
      </thead>
      <tbody>
        {rows.map((row, i) => {
          const first = bySize ? (row.size ? String(row.size.size) : "") : String(i + 1);
          return (
            <tr key={i} class={row.m === r.best[0] ? "plumb-search-best" : undefined}>
              <td>{first}</td>
              <th scope="row">
                <code>{chosenWords(row.m)}</code>
                {row.m === r.best[0] ? " (best)" : ""}
              </th>
              <td>{row.m.k}</td>
              {texts[i].map((t, c) => <td key={c}>{t}</td>)}
              {add && (
                <td>
                  <button
                    type="button"
                    class="pl-link"
                    title={`Add a fit cell of ${modelWords(row.m)} below this search`}
                    onClick={(e) => add(row.m, e.currentTarget as HTMLElement)}
                  >
                    add as fit
                  </button>
                </td>
              )}
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}

/** The numeric columns of a model table, each column's values printed distinct. */
function columnTexts(r: SearchResult, models: SearchModel[]): string[][] {
  const near = (x: number | null, e: number) => formatNearOne(x, e);
  const sig = (digits: number) => (x: number | null, e: number) => formatNumber(x, digits + e);
  type Column = [(m: SearchModel) => number | null, (x: number | null, e: number) => string];
  const columns: Column[] = [
    [(m) => m.criterion, r.by === "adj_r2" ? near : sig(r.by === "loo" ? 4 : 6)],
    [(m) => m.delta, sig(3)],
  ];
  if (r.by !== "adj_r2") columns.push([(m) => m.adj_r2, near]);
  if (r.by !== "loo" && r.loo_given) columns.push([(m) => m.loo_rmse, sig(4)]);
  // Subsets with one column space (x1 + x2 and x1 + x12 when x12 = x1 + x2) tie up to rounding:
  // 12 digits keep every real difference and print such ties alike.
  const tie = (x: number | null) => x === null ? null : Number(x.toPrecision(12));
  const byColumn = columns.map(([get, format]) =>
    distinctTexts(models.map((m) => tie(get(m))), format)
  );
  return models.map((_, i) => byColumn.map((c) => c[i]));
}

function chosenWords(m: SearchModel): string {
  return m.chosen.length > 0 ? m.chosen.join(" + ") : "none";
}

function modelWords(m: SearchModel): string {
  return m.predictors.length > 0 ? m.predictors.join(" + ") : "the intercept alone";
}

function verdict(r: SearchResult): string {
  const best = r.best[0];
  if (best === undefined) return `No subset could be ranked by ${r.criterion}.`;
  const value = r.by === "adj_r2" ? formatNearOne(best.criterion) : formatNumber(best.criterion, 6);
  const next = r.best[1];
  const second = next === undefined
    ? ""
    : ` The next: ${modelWords(next)} (Δ ${r.criterion} ${formatNumber(next.delta, 3)}).`;
  return `Best by ${r.criterion}: ${modelWords(best)} (${r.criterion} ${value}, k ${best.k}) of ${
    r.subsets_evaluated.toLocaleString("en-US")
  } subsets of ${r.candidates.length} candidates on ${r.n.toLocaleString("en-US")} rows.${second}`;
}

function heldByAll(r: SearchResult): string {
  const held = [...(r.intercept ? ["an intercept"] : []), ...r.always.map((c) => `"${c}"`)];
  const base = held.length > 0
    ? `Every model holds ${held.join(" and ")}`
    : "No model has an intercept";
  return `${base}; candidates: ${r.candidates.join(", ")}${
    r.largest < r.candidates.length ? ` (at most ${r.largest} a model)` : ""
  }.`;
}

function aliasedNote(r: SearchResult): string {
  const sets = r.aliased_examples.map((s) => s.join(" + ")).join("; ");
  return `${r.aliased.toLocaleString("en-US")} aliased subsets (a candidate in each is a linear ` +
    `combination of the others) are ranked last and not listed; the smallest found: ${sets}.`;
}

function inexactNote(r: SearchResult): string {
  const sizes = r.sizes.filter((s) => !s.exact).map((s) => s.size).join(", ");
  return `Leave-one-out lists of sizes ${sizes} rank only the subsets of smallest RSS of those ` +
    `sizes; the best overall is ${
      r.exact ? "proven (PRESS ≥ RSS rules out the rest)" : "the best of those fitted"
    }.`;
}

/** The `search` kind's page face: its view, for the live page and the record. */
export const searchPage: PageFace<SearchResult, VNode> = { kind: "search", view: SearchView };
