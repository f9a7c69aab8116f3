/**
 * Turning a listed model into a `fit` cell from the page: the body of the
 * new cell, and the request that inserts it below the search (POST
 * /api/cell/new with a `body`, kernel/server/protocol.ts `NewCellRequest`,
 * through ui/api.ts).
 *
 * The page's view props carry no document version, so the request reads
 * what the page already shows: the version on the page's root
 * (`data-version`) and the cell names on the blocks (`data-block`). The save
 * path checks the version as for any edit: a document changed meanwhile is
 * refused (409) and nothing is written.
 *
 * @module
 */
import { newCell } from "../../ui/api.ts";
import type { SearchModel, SearchResult } from "./result.ts";

/**
 * The body of a fit cell of one listed model.
 *
 * @param r The search result (its table and k convention).
 * @param m The model.
 * @returns YAML options: `on`, `model` and, when the search counted k without the variance, `count_variance`.
 * @example
 * ```ts
 * import { fitBody } from "./add_fit.ts";
 * const body = fitBody({ on: "runs", count_variance: true } as never, { model: "y = linear(a, b)" } as never);
 * if (body !== "on: runs\nmodel: y = linear(a, b)\n") throw new Error(body);
 * ```
 */
export function fitBody(r: SearchResult, m: SearchModel): string {
  return `on: ${r.on}\nmodel: ${m.model}\n${r.count_variance ? "" : "count_variance: false\n"}`;
}

/**
 * A name for the new fit: `<search>-fit`, else `<search>-fit-2`, `-3`, …
 *
 * @param search The search cell's name.
 * @param taken Names in the document.
 * @returns A free name.
 * @example
 * ```ts
 * import { fitName } from "./add_fit.ts";
 * if (fitName("drivers", new Set(["drivers-fit"])) !== "drivers-fit-2") throw new Error("free name");
 * ```
 */
export function fitName(search: string, taken: ReadonlySet<string>): string {
  const first = `${search}-fit`;
  if (!taken.has(first)) return first;
  for (let i = 2;; i++) if (!taken.has(`${first}-${i}`)) return `${first}-${i}`;
}

/**
 * Adds a fit cell below the search, on the live page.
 *
 * @param from The element clicked (inside the page).
 * @param search The search cell's name.
 * @param body The new cell's body.
 * @returns What happened, in words.
 */
export async function addFitCell(from: HTMLElement, search: string, body: string): Promise<string> {
  const base = from.closest("[data-version]")?.getAttribute("data-version");
  if (!base) return "Cannot add a fit: the page does not know the document's version yet";
  const taken = new Set(
    [...from.ownerDocument.querySelectorAll("[data-block]")].map((e) =>
      e.getAttribute("data-block") ?? ""
    ),
  );
  const name = fitName(search, taken);
  const out = await newCell({ after: search, kind: "fit", name, base, body });
  if (out.ok) return `Added fit "${name}" below this search`;
  return out.conflict !== null
    ? "The document changed on disk meanwhile; nothing was written. Try again"
    : out.error;
}
