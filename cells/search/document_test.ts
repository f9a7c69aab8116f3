/**
 * A search cell through a real document and the compute worker, and the
 * claim the kind makes: the best model's criterion is what a `fit` cell of
 * that model and a `compare` of it give (the source of the expected values
 * here; 1e-9 relative, far above the rounding of either QR route).
 */
import { equal, ok } from "node:assert/strict";
import { registry } from "../mod.ts";
import { Session } from "../../kernel/session/session.ts";
import type { CellReport } from "../../kernel/session/types.ts";
import type { CompareResult } from "../compare/mod.ts";
import type { FitResult } from "../fit/mod.ts";
import type { SearchResult } from "./result.ts";
import { invented } from "./_testing.ts";

const WORKER = new URL("../worker.ts", import.meta.url);

function close(a: number | null, b: number | null, what: string): void {
  ok(a !== null && b !== null, `${what}: ${a} vs ${b}`);
  ok(Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(b)), `${what}: ${a} vs ${b}`);
}

async function runIn(dir: string, source: string): Promise<Map<string, CellReport>> {
  const session = new Session({ registry, workerUrl: WORKER, dir });
  try {
    const report = await session.run(source);
    return new Map(report.cells.map((c) => [c.name, c]));
  } finally {
    session.close();
  }
}

Deno.test("a search's best model gives the same criteria as a fit of it and a compare", async () => {
  const dir = await Deno.makeTempDir({ prefix: "plumb-search-" });
  try {
    // Invented data: six candidates, three of them in the response, printed as %.10g.
    const cols = invented(48, 6, 31);
    const names = Object.keys(cols);
    const lines = Array.from(
      { length: 48 },
      (_, i) => names.map((c) => Number(cols[c][i].toPrecision(10))).join(","),
    );
    await Deno.writeTextFile(`${dir}/runs.csv`, `${names.join(",")}\n${lines.join("\n")}\n`);
    const table = "```table runs\nfrom: runs.csv\nunits: { y: kg }\n```\n\n";
    const searchCell = "```search drivers\non: runs\nresponse: y\nby: aicc\n```\n";
    const first = await runIn(dir, table + searchCell);
    const drivers = first.get("drivers")!;
    equal(drivers.state, "current", drivers.error?.message);
    const r = drivers.result as SearchResult;
    equal(r.subsets_evaluated, 64, "2^6 subsets (exact arithmetic)");
    equal(r.response_unit, "kg");
    ok(drivers.summaryLine!.startsWith("best by AICc: "), drivers.summaryLine!);
    const [best, next] = r.best;
    const fits = [best, next].map((m, i) =>
      "```fit f" + i + "\non: runs\nmodel: " + m.model + "\n```\n\n"
    ).join("");
    const compare = "```compare both\nfits: [f0, f1]\nby: aicc\n```\n";
    const second = await runIn(dir, table + searchCell + fits + compare);
    const fit = second.get("f0")!.result as FitResult;
    const cmp = second.get("both")!.result as CompareResult;
    equal(cmp.preferred, "f0");
    const row = cmp.rows.find((x) => x.fit === "f0")!;
    close(best.criterion, row.aicc, "AICc");
    close(best.aic, row.aic, "AIC");
    close(best.bic, row.bic, "BIC");
    close(best.loo_rmse, row.loo_rmse, "LOO RMSE");
    close(best.adj_r2, fit.adj_r2, "adjusted R²");
    close(best.rss, fit.rss, "RSS");
    equal(best.k, row.k);
    close(next.delta, cmp.rows.find((x) => x.fit === "f1")!.delta, "Δ AICc");
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});
