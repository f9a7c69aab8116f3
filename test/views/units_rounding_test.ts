/**
 * Views show units and round as metrology does (issue 13 #1, #2): on the
 * demo, and on a calibration-like document (invented data: a sensor's
 * reading against a reference temperature, nearly exact, so the intervals
 * are narrow beside the estimates).
 */
import { match, ok } from "node:assert/strict";
import { renderToString } from "preact-render-to-string";
import { h } from "preact";
import { registry } from "../../cells/mod.ts";
import { pages } from "../../cells/pages.ts";
import { Session } from "../../kernel/session/session.ts";

const DEMO = new URL("../../examples/fade/fade.md", import.meta.url);

async function render(text: string, dir: string): Promise<Map<string, string>> {
  const session = new Session({
    registry,
    workerUrl: new URL("../../cells/worker.ts", import.meta.url),
    dir,
  });
  try {
    const report = await session.run(text);
    const out = new Map<string, string>();
    for (const c of report.cells) {
      ok(c.state === "current", `${c.name}: ${c.error?.message}`);
      out.set(
        c.name,
        renderToString(h(pages.get(c.kind)!.view, { name: c.name, result: c.result })),
      );
    }
    return out;
  } finally {
    session.close();
  }
}

Deno.test("views show the demo's units: parameters, σ, predictions, check axes", async () => {
  const html = await render(await Deno.readTextFile(DEMO), new URL(".", DEMO).pathname);
  const root = html.get("root")!;
  match(root, /<td class="plumb-unit">mAh<\/td>/, "q0 in mAh");
  match(root, /mAh\/cycles\^0\.5|mAh\/cycles\*\*0\.5|mAh·cycles/, "a's derived unit");
  match(root, /Scatter about the model[^<]*<\/dt><dd[^>]*>1\.7\d* mAh/);
  ok(!root.includes("Residual standard error"), "our own words for σ");
  const predict = html.get("end-of-life")!;
  match(predict, /Estimate \(mAh\)/);
  match(predict, /cycle = \d+(\.\d+)? cycles/, "solved x with its unit");
  const check = html.get("root-residuals")!;
  ok(
    check.includes("fitted (mAh)") && check.includes("residual (mAh)"),
    "check axes carry sigma_unit",
  );
  const chart = html.get("fade-overview")!;
  ok(chart.includes("capacity (mAh)") && chart.includes("cycle (cycles)"));
  ok(!/[↑→]/.test(chart + check), "no arrow axis labels");
});

const CALIBRATION = `---
title: Sensor calibration (invented)
confidence: 0.95
---

\`\`\`table cal
columns: [T_ref, reading]
rows:
  - [0, 100.0003]
  - [20, 107.7897]
  - [40, 115.5406]
  - [60, 123.2394]
  - [80, 130.8861]
  - [100, 138.5012]
  - [120, 146.0601]
  - [140, 153.5734]
units: { T_ref: °C, reading: Ω }
\`\`\`

\`\`\`fit curve
on: cal
model: reading = r0 + a*T_ref + b*T_ref^2
\`\`\`

\`\`\`predict at100
fit: curve
at: { T_ref: [100] }
\`\`\`
`;

Deno.test("views round a calibration's estimates and intervals to their uncertainty (GUM §7.2.6)", async () => {
  const html = await render(CALIBRATION, await Deno.makeTempDir());
  const fit = html.get("curve")!;
  // The intercept near 100 Ω: interval limits keep the digits of their standard uncertainty.
  const row = fit.match(
    /<code>r0<\/code><\/th><td>([^<]+)<\/td><td[^>]*>([^<]*)<\/td><td>([^<]+)<\/td><td>([^<]+)<\/td>/,
  );
  ok(row, fit.slice(0, 400));
  const [, est, unit, u, ci] = row;
  ok(unit === "Ω", unit);
  const decimals = (s: string) => (s.split(".")[1] ?? "").length;
  ok(decimals(est) >= 3 && decimals(est) === decimals(u), `${est} and ${u}`);
  const [lo, hi] = ci.split(" … ");
  ok(
    decimals(lo) === decimals(est) && decimals(hi) === decimals(est),
    `${ci} to the place of ${est}`,
  );
  ok(lo !== hi, "the interval's limits differ");
  const predict = html.get("at100")!;
  const m = predict.match(/\[(\d+\.\d+), (\d+\.\d+)\]/);
  ok(m && m[1] !== m[2] && decimals(m[1]) >= 3, `interval of the prediction at 100 °C: ${m?.[0]}`);
  // The column name is shown as written (the underscore kept).
  ok(predict.includes("T_ref"), "T_ref as written");
});

const NITRITE = new URL("../../examples/calibration/nitrite.md", import.meta.url);

Deno.test("views show the calibration example's units: fit, inverse prediction, chart axes", async () => {
  // Units by dimensional analysis, worked by hand: absorbance (AU) = b0 + b1·conc + b2·conc²
  // with conc in mg/L gives b1 in AU·L/mg and b2 in AU·L²/mg² (SI Brochure §5.4 writing).
  const html = await render(
    await Deno.readTextFile(NITRITE),
    new URL(".", NITRITE).pathname,
  );
  const quad = html.get("quad-x")!;
  ok(quad.includes("AU·L/mg") && quad.includes("AU·L^2/mg^2"), quad.slice(0, 400));
  const unknowns = html.get("unknowns")!;
  ok(/mg\/L/.test(unknowns), "solved concentrations carry mg/L");
  const chart = html.get("calibration-curve")!;
  ok(chart.includes("conc (mg/L)") && chart.includes("absorbance (AU)"), "both axes carry units");
});
