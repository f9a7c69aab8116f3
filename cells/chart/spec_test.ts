import { deepEqual, equal, throws } from "node:assert/strict";
import { CellError } from "../../kernel/errors.ts";
import { parseChartSpec } from "./spec.ts";
import { SETTINGS } from "./_testing.ts";
import { chartKind } from "./mod.ts";

function parse(options: Record<string, unknown>) {
  return parseChartSpec({
    name: "c",
    kind: "chart",
    body: "",
    options,
    settings: SETTINGS,
    warn: () => {},
  });
}

function refused(options: Record<string, unknown>, message: string, path: (string | number)[]) {
  throws(() => parse(options), (e: unknown) => {
    if (!(e instanceof CellError)) return false;
    equal(e.message, message);
    deepEqual(e.path, path);
    return true;
  });
}

Deno.test("parseChartSpec() fills defaults", () => {
  deepEqual(parse({ on: "t", x: "x", y: "y" }), {
    on: "t",
    x: "x",
    y: "y",
    fits: [],
    band: null,
    residuals: false,
    logX: false,
    logY: false,
    title: null,
    binAbove: 5000,
  });
  deepEqual(parse({ on: "t", x: "x", y: "y", fits: "line", log: "both" }).fits, ["line"]);
});

Deno.test("parseChartSpec() refuses unknown options with a suggestion", () => {
  refused(
    { on: "t", x: "x", y: "y", fit: ["line"] },
    `Unknown option "fit" in chart "c": did you mean "fits"?`,
    ["fit"],
  );
});

Deno.test("parseChartSpec() refuses missing and malformed options at their place", () => {
  refused(
    { x: "x", y: "y" },
    `Missing "on" in chart "c": name the table cell to draw, as in on: cycles`,
    [],
  );
  refused({ on: "t", x: "x y", y: "y" }, `Option "x" of chart "c" is "x y": expected one name`, [
    "x",
  ]);
  refused(
    { on: "t", x: "x", y: "y", fits: ["a", "a"] },
    `Fit "a" is listed twice in "fits" of chart "c"`,
    ["fits", 1],
  );
  refused(
    { on: "t", x: "x", y: "y", log: "z" },
    `Option "log" of chart "c" is "z": expected x, y, both or none`,
    ["log"],
  );
  refused(
    { on: "t", x: "x", y: "y", residuals: "yes" },
    `Option "residuals" of chart "c" is "yes": expected true or false`,
    ["residuals"],
  );
  refused(
    { on: "t", x: "x", y: "y", bin_above: 2.5 },
    `Option "bin_above" of chart "c" is "2.5": expected a whole number of rows, 0 or more`,
    ["bin_above"],
  );
});

Deno.test("chartKind.inputs() lists the table and every fit, the band's once", () => {
  const spec = parse({ on: "t", x: "x", y: "y", fits: ["line", "root"], band: "power" });
  deepEqual(chartKind.inputs(spec), [
    { name: "t", accepts: ["Table"], path: ["on"] },
    { name: "line", accepts: ["Fit"], path: ["fits", 0] },
    { name: "root", accepts: ["Fit"], path: ["fits", 1] },
    { name: "power", accepts: ["Fit"], path: ["band"] },
  ]);
  const listed = parse({ on: "t", x: "x", y: "y", fits: ["root"], band: "root" });
  equal(chartKind.inputs(listed).length, 2);
});
