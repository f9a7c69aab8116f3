/**
 * The product's page faces: each kind's view, for the browser bundle and the
 * static record. Imports `cells/<kind>/view.tsx` only (never a kind's
 * `mod.ts`), so the page holds rendering code and none of the compute code;
 * the compute registry is `mod.ts` beside this file. A kind without a page
 * face here is drawn by ui/generic_view.tsx (test/architecture checks that
 * every kind of the compute registry has one).
 *
 * Adding a kind: list its page face here and its compute face in `mod.ts`.
 *
 * @module
 */
import type { ComponentType, VNode } from "preact";
import type { PageFace, ViewProps } from "../kernel/contract/mod.ts";
import { tablePage } from "./table/view.tsx";
import { fitPage } from "./fit/view.tsx";
import { comparePage } from "./compare/view.tsx";
import { checkPage } from "./check/view.tsx";
import { predictPage } from "./predict/view.tsx";
import { chartPage } from "./chart/view.tsx";
import { searchPage } from "./search/view.tsx";
import { calcPage } from "./calc/view.tsx";
import { jointPage } from "./joint/view.tsx";
import { agreementPage } from "./agreement/view.tsx";

// deno-lint-ignore no-explicit-any
type AnyPage = PageFace<any, VNode>;

/** Every page face, by kind name. */
export const pages: ReadonlyMap<string, AnyPage> = new Map(
  [
    tablePage,
    fitPage,
    comparePage,
    checkPage,
    predictPage,
    chartPage,
    searchPage,
    calcPage,
    jointPage,
    agreementPage,
  ]
    .map((p) => [p.kind, p]),
);

/**
 * The view of a kind.
 *
 * @param kind The kind's name.
 * @returns Its component, or undefined when the page has none.
 * @example
 * ```ts
 * import { viewOf } from "./pages.ts";
 * if (viewOf("fit") === undefined || viewOf("nope") !== undefined) throw new Error("registry");
 * ```
 */
// deno-lint-ignore no-explicit-any
export function viewOf(kind: string): ComponentType<ViewProps<any>> | undefined {
  return pages.get(kind)?.view;
}
