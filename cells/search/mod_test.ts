import { equal } from "node:assert/strict";
import type { TemplateCell } from "../../kernel/contract/mod.ts";
import { searchKind } from "./mod.ts";

const col = (name: string, type: "number" | "text" = "number") => ({ name, type, unit: null });

const TABLE: TemplateCell = {
  name: "cycles",
  kind: "table",
  output: "Table",
  inputs: [],
  result: null,
  columns: [col("cycle"), col("capacity"), col("temperature"), col("operator", "text")],
};

Deno.test("the search template searches the last fit's response over its table's other columns", () => {
  const fit: TemplateCell = {
    name: "line",
    kind: "fit",
    output: "Fit",
    inputs: ["cycles"],
    columns: [],
    result: { response: "capacity", model: "capacity = q0 + a*cycle" },
  };
  equal(
    searchKind.template({ cells: [TABLE, fit] }),
    "on: cycles\nresponse: capacity\ncandidates: [cycle, temperature]\n",
  );
});

Deno.test("the search template without a fit takes the last number column as the response", () => {
  equal(
    searchKind.template({ cells: [TABLE] }),
    "on: cycles\nresponse: temperature\ncandidates: [cycle, capacity]\n",
  );
  equal(
    searchKind.template({ cells: [] }),
    "on: table1\nresponse: y\ncandidates: [x1, x2]\n",
  );
});
