/**
 * A robust fit read by the kinds that read fits: compare refuses it in a
 * sentence, check judges its residuals and says it is robust, predict's
 * intervals use its sandwich covariance, chart draws its curve and band.
 * Data: Brownlee's stack loss reduced to one predictor (air flow), as in
 * robust_test.ts; checks are identities (same covariance, same estimates),
 * no published values.
 */
import assert from "node:assert/strict";
import { CellError } from "../../kernel/errors.ts";
import type { CellKind, CellOutput, RunContext } from "../../kernel/contract/mod.ts";
import { fitKind } from "./mod.ts";
import type { Fit } from "./fit.ts";
import { compareKind } from "../compare/mod.ts";
import { checkKind } from "../check/mod.ts";
import { predictKind } from "../predict/mod.ts";
import { chartKind } from "../chart/mod.ts";
import { makeTable, SETTINGS } from "./_fixtures_test.ts";

const AIR = [80, 80, 75, 62, 62, 62, 62, 62, 58, 58, 58, 58, 58, 58, 50, 50, 50, 50, 50, 56, 70];
const LOSS = [42, 37, 37, 28, 18, 18, 19, 20, 15, 14, 14, 13, 11, 12, 8, 7, 8, 8, 9, 15, 15];

async function runCell(
  // deno-lint-ignore no-explicit-any
  kind: CellKind<any, any, any>,
  name: string,
  options: Record<string, unknown>,
  inputs: Record<string, CellOutput>,
) {
  const warnings: string[] = [];
  const spec = kind.parse({
    name,
    kind: kind.kind,
    options,
    body: "",
    settings: SETTINGS,
    warn: (m) => warnings.push(m),
  });
  const ctx: RunContext = {
    name,
    settings: SETTINGS,
    inputs,
    files: {},
    warn: (m) => warnings.push(m),
    progress: () => {},
  };
  const out = await kind.run(spec, ctx);
  return { out, result: kind.summary(out, spec), warnings };
}

async function cells() {
  const data = makeTable({ air: AIR, loss: LOSS });
  const ls = await runCell(fitKind, "ls", { on: "data", model: "loss = a + b*air" }, { data });
  const rob = await runCell(
    fitKind,
    "rob",
    { on: "data", model: "loss = a + b*air", loss: "huber" },
    { data },
  );
  return { data, ls: ls.out as Fit, rob: rob.out as Fit };
}

Deno.test("compare refuses a robust fit at its place, in a sentence", async () => {
  const { ls, rob } = await cells();
  await assert.rejects(
    () => runCell(compareKind, "cmp", { fits: ["ls", "rob"] }, { ls, rob }),
    (e: unknown) => {
      assert.ok(e instanceof CellError);
      assert.deepEqual(e.path, ["fits", 1]);
      assert.match(e.message, /fit "rob" is a robust M-estimate \(loss huber\).*AIC/);
      return true;
    },
  );
});

Deno.test("check judges a robust fit's residuals and says it is robust", async () => {
  const { rob } = await cells();
  const c = await runCell(checkKind, "judge", { fit: "rob" }, { rob });
  assert.ok(
    c.warnings.some((w) => /"rob" is a robust fit \(huber loss/.test(w)),
    c.warnings.join(),
  );
  // Its residuals are the fit's (the M-estimate's), row for row.
  const res = (c.result as { residuals: ArrayLike<number> }).residuals;
  assert.deepEqual(Array.from(res), Array.from(rob.residuals));
  await assert.rejects(
    () => runCell(checkKind, "judge", { fit: "rob", robust: "hc3" }, { rob }),
    (e: unknown) => e instanceof CellError && e.path[0] === "robust",
  );
});

Deno.test("predict takes a robust fit's sandwich covariance for se_fit", async () => {
  const { rob } = await cells();
  const p = await runCell(predictKind, "at60", { fit: "rob", at: { air: [60] } }, { rob });
  const r = p.result as { at: { estimate: number; se_fit: number }[]; covariance: string };
  const cov = rob.statistics.covariance;
  // se_fit² = gᵀ·C·g with g = (1, 60): the fit's own (sandwich) covariance, identity.
  const want = Math.sqrt(cov[0] + 2 * 60 * cov[1] + 3600 * cov[3]);
  assert.ok(Math.abs(r.at[0].se_fit - want) <= 1e-12 * want, `${r.at[0].se_fit} vs ${want}`);
  assert.ok(Math.abs(r.at[0].estimate - (rob.estimates[0] + 60 * rob.estimates[1])) < 1e-12);
  assert.match(r.covariance, /sandwich/);
  await assert.rejects(
    () => runCell(predictKind, "at60", { fit: "rob", at: { air: [60] }, robust: "hc0" }, { rob }),
    (e: unknown) => e instanceof CellError && e.path[0] === "robust",
  );
});

Deno.test("chart draws a robust fit beside the least-squares fit, with its band", async () => {
  const { data, ls, rob } = await cells();
  const c = await runCell(
    chartKind,
    "both",
    { on: "data", x: "air", y: "loss", fits: ["ls", "rob"], band: "rob" },
    { data, ls, rob },
  );
  const r = c.result as {
    grid: number[];
    curves: { fit: string; y: number[] }[];
    band: { lo: number[]; hi: number[] } | null;
  };
  const curve = r.curves.find((k) => k.fit === "rob")!;
  r.grid.forEach((x, i) =>
    assert.ok(
      // The chart's result keeps 7 significant digits.
      Math.abs(curve.y[i]! - (rob.estimates[0] + rob.estimates[1] * x)) <
        1e-6 * Math.abs(curve.y[i]!),
      `${curve.y[i]} at ${x}: ${rob.estimates}`,
    )
  );
  assert.ok(r.band !== null && r.band.lo.every((v, i) => v < r.band!.hi[i]));
  assert.notDeepEqual(Array.from(ls.estimates), Array.from(rob.estimates));
});
