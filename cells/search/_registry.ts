/**
 * The compute registry with the search kind, for the search's own document
 * tests while the product registry (cells/mod.ts) does not list it yet;
 * once it does, this is that registry. `_test_worker.ts` serves it.
 *
 * @module
 */
import { makeRegistry, type Registry } from "../../kernel/contract/mod.ts";
import { registry as product } from "../mod.ts";
import { searchKind } from "./mod.ts";

/** Every product kind and the search kind. */
export const withSearch: Registry = product.has("search")
  ? product
  : makeRegistry([...product.values(), searchKind]);
