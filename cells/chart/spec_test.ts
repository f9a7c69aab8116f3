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
    bandFor: "mean",
    bandMethod: "pointwise",
    bandLevel: null,
    newObservations: 1,
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

Deno.test("parseChartSpec() reads the band options", () => {
  const spec = parse({
    on: "t",
    x: "x",
    y: "y",
    band: "root",
    band_for: "both",
    band_method: "scheffe",
    band_level: 0.9,
    new_observations: 3,
  });
  deepEqual(
    [spec.bandFor, spec.bandMethod, spec.bandLevel, spec.newObservations],
    ["both", "scheffe", 0.9, 3],
  );
});

Deno.test("parseChartSpec() refuses band options without a band, and bad ones, at their place", () => {
  refused(
    { on: "t", x: "x", y: "y", fits: ["root"], band_method: "scheffe" },
    `Option "band_method" of chart "c" needs "band": name the fit whose band is drawn, as in band: root`,
    ["band_method"],
  );
  refused(
    { on: "t", x: "x", y: "y", band: "root", band_method: "sheffe" },
    `Option "band_method" of chart "c" is "sheffe": did you mean "scheffe"?`,
    ["band_method"],
  );
  refused(
    { on: "t", x: "x", y: "y", band: "root", band_for: "observation", band_method: "bootstrap" },
    `Option "band_method" of chart "c" is "bootstrap", and the bootstrap band is of the mean only (the refits give curves, not new observations): use band_method: scheffe for a simultaneous band of a new observation`,
    ["band_method"],
  );
  refused(
    { on: "t", x: "x", y: "y", band: "root", band_level: 95 },
    `Option "band_level" of chart "c" is "95": expected a level in (0, 1), such as 0.95`,
    ["band_level"],
  );
  refused(
    { on: "t", x: "x", y: "y", band: "root", band_for: "both", new_observations: 0 },
    `Option "new_observations" of chart "c" is "0": expected a whole number of new observations, 1 or more`,
    ["new_observations"],
  );
  refused(
    { on: "t", x: "x", y: "y", band: "root", new_observations: 4 },
    `Option "new_observations" of chart "c" applies to the band of a new observation: add band_for: observation (or both)`,
    ["new_observations"],
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
