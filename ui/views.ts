/**
 * The page's registry of views: each kind's `view` component, imported from
 * `cells/<kind>/view.tsx` only (never a kind's `mod.ts`), so the browser
 * bundle holds rendering code and none of the kernel code that needs Deno.
 * A kind without a view here is drawn by {@link ./generic_view.tsx}.
 *
 * Adding a kind's view: import its component and list it in `VIEWS`.
 *
 * @module
 */
import type { ComponentType } from "preact";
import type { ViewProps } from "../cells/types.ts";
import { TableView } from "../cells/table/view.tsx";
import { FitView } from "../cells/fit/view.tsx";
import { CompareView } from "../cells/compare/view.tsx";
import { CheckView } from "../cells/check/view.tsx";
import { PredictView } from "../cells/predict/view.tsx";
import { ChartView } from "../cells/chart/view.tsx";

// deno-lint-ignore no-explicit-any
type AnyView = ComponentType<ViewProps<any>>;

/** The view of each kind the page knows, by kind name. */
export const VIEWS: Readonly<Record<string, AnyView>> = {
  table: TableView,
  fit: FitView,
  compare: CompareView,
  check: CheckView,
  predict: PredictView,
  chart: ChartView,
};

/**
 * The view of a kind.
 *
 * @param kind The kind's name.
 * @returns Its component, or undefined when the page has none.
 * @example
 * ```ts
 * import { viewOf } from "./views.ts";
 * if (viewOf("fit") === undefined || viewOf("nope") !== undefined) throw new Error("registry");
 * ```
 */
export function viewOf(kind: string): AnyView | undefined {
  return Object.hasOwn(VIEWS, kind) ? VIEWS[kind] : undefined;
}
