/**
 * The product's cell kinds. Adding a kind: write `cells/<kind>/mod.ts`
 * exporting its record, then list it here (see DEVELOPERS.md).
 *
 * @module
 */
import { makeRegistry, type Registry } from "../kernel/contract/mod.ts";
import { tableKind } from "./table/mod.ts";
import { fitKind } from "./fit/mod.ts";
import { predictKind } from "./predict/mod.ts";
import { compareKind } from "./compare/mod.ts";
import { chartKind } from "./chart/mod.ts";
import { checkKind } from "./check/mod.ts";
import { searchKind } from "./search/mod.ts";
import { calcKind } from "./calc/mod.ts";
import { jointKind } from "./joint/mod.ts";
import { agreementKind } from "./agreement/mod.ts";

/** Every kind Plumb knows, by name. */
export const registry: Registry = makeRegistry([
  tableKind,
  fitKind,
  predictKind,
  compareKind,
  checkKind,
  chartKind,
  searchKind,
  calcKind,
  jointKind,
  agreementKind,
]);
