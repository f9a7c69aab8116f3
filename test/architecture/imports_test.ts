/**
 * The house's import rules (DESIGN.md §2, DEVELOPERS.md "Boundaries"):
 *
 * ```
 *   cells/main.ts ──▶ kernel/cli        cells/worker.ts ──▶ kernel/worker
 *        │                                     │
 *        └──▶ cells/mod.ts (compute faces) ◀───┘      no ui/, no .tsx, no view library
 *   ui/ ──▶ cells/pages.ts (page faces: view.tsx) ──▶ ui/charts …
 *   kernel/ ──▶ kernel/ only (the contract lives in kernel/contract/)
 * ```
 *
 * 1. `kernel/` imports nothing under `cells/` or `ui/` (its tests included).
 * 2. The compute faces (everything `cells/mod.ts` and `cells/worker.ts` reach)
 *    import no module under `ui/`, no `.tsx` file and no UI library.
 * 3. Only page faces import `ui/`: a file under `cells/` that imports `ui/`
 *    is reached from `cells/pages.ts` and never from the compute registry.
 * 4. `deno info` of the compute worker's entry lists no UI library at all
 *    (the runtime's own view of the module graph, npm packages included).
 *
 * Imports are read as text (static `import … from`, `export … from` and
 * `import("…")` with a literal specifier).
 */
import { deepEqual, ok } from "node:assert/strict";
import { dirname, join, relative, resolve } from "node:path";
import { fileURLToPath } from "node:url";

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), "../..");
/** Packages that belong to the page: the view library, the plotting library and what it draws with, math and Markdown. */
const UI_PACKAGES =
  /^(preact|preact-render-to-string|@preact\/|@observablehq\/plot|d3|d3-|katex|markdown-it|linkedom|interval-tree|isoformat)/;

/** Every .ts/.tsx file under a folder, as paths from the root. */
function walk(dir: string): string[] {
  const out: string[] = [];
  for (const e of Deno.readDirSync(join(ROOT, dir))) {
    const p = join(dir, e.name);
    if (e.isDirectory) out.push(...walk(p));
    else if (/\.tsx?$/.test(e.name)) out.push(p);
  }
  return out;
}

const SPEC = /(?:^|\n)\s*(?:import|export)\s[^;]*?from\s*"([^"]+)"|import\(\s*"([^"]+)"\s*\)/g;

/** The specifiers a file imports: relative ones resolved to paths from the root, others as written. */
function importsOf(file: string): string[] {
  const text = Deno.readTextFileSync(join(ROOT, file));
  const out: string[] = [];
  for (const m of text.matchAll(SPEC)) {
    const spec = m[1] ?? m[2];
    out.push(spec.startsWith(".") ? relative(ROOT, resolve(ROOT, dirname(file), spec)) : spec);
  }
  return out;
}

/** The bare package name a specifier names (deno.json maps bare names to npm). */
const packageOf = (spec: string) =>
  spec.replace(/^npm:\/?/, "").replace(/^(@?[^@/]+(?:\/[^@/]+)?)@.*$/, "$1");

/** Every file reached from the entries by relative imports. */
function reach(entries: string[]): Set<string> {
  const seen = new Set<string>();
  const stack = [...entries];
  while (stack.length > 0) {
    const f = stack.pop()!;
    if (seen.has(f)) continue;
    seen.add(f);
    for (const s of importsOf(f)) if (/\.tsx?$/.test(s) && !s.includes(":")) stack.push(s);
  }
  return seen;
}

Deno.test("kernel/ imports nothing under cells/ or ui/", () => {
  const bad = walk("kernel").flatMap((f) =>
    importsOf(f).filter((s) => s.startsWith("cells/") || s.startsWith("ui/")).map((s) =>
      `${f} → ${s}`
    )
  );
  deepEqual(bad, []);
});

Deno.test("compute faces import no ui/, no .tsx and no UI library", () => {
  const compute = reach(["cells/mod.ts", "cells/worker.ts", "cells/main.ts"]);
  ok(compute.has("cells/fit/mod.ts") && compute.has("kernel/worker/compute_worker.ts"));
  const bad: string[] = [];
  for (const f of compute) {
    if (f.startsWith("ui/") || f.endsWith(".tsx")) bad.push(f);
    for (const s of importsOf(f)) if (UI_PACKAGES.test(packageOf(s))) bad.push(`${f} → ${s}`);
  }
  deepEqual(bad, []);
});

Deno.test("only page faces import ui/", () => {
  const compute = reach(["cells/mod.ts", "cells/worker.ts", "cells/main.ts"]);
  const page = reach(["cells/pages.ts"]);
  const bad = walk("cells").filter((f) =>
    !f.endsWith("_test.ts") && !f.endsWith("_test.tsx") &&
    importsOf(f).some((s) => s.startsWith("ui/")) && (compute.has(f) || !page.has(f))
  );
  deepEqual(bad, []);
});

Deno.test("deno info of the compute worker's entry lists no UI library", async () => {
  const out = await new Deno.Command(Deno.execPath(), {
    args: ["info", "--json", "cells/worker.ts"],
    cwd: ROOT,
    stdout: "piped",
    stderr: "piped",
  }).output();
  ok(out.success, new TextDecoder().decode(out.stderr));
  // `npmPackages` lists the whole lock file; what the graph uses are its modules and their
  // dependencies' specifiers (an npm package appears as an `npm:` specifier there).
  const info = JSON.parse(new TextDecoder().decode(out.stdout)) as {
    modules: {
      specifier: string;
      dependencies?: { specifier: string; code?: { specifier: string } }[];
    }[];
  };
  const used = info.modules.flatMap((m) => [
    m.specifier,
    ...(m.dependencies ?? []).map((d) => d.code?.specifier ?? d.specifier),
  ]);
  const bad = used.filter((s) =>
    s.includes("/ui/") || s.endsWith(".tsx") ||
    (s.startsWith("npm:") && UI_PACKAGES.test(packageOf(s)))
  );
  deepEqual(bad, []);
  // A budget against unnoticed growth (issue 9 took the graph from 257 modules to 184), raised
  // deliberately when a concern is added and worker_startup (`deno task bench --startup`) still
  // meets its target: 200 → 225 for kernel/units (dimensional analysis of models, issue 13);
  // 225 → 240 for the search kind (cells/search, issue 16: 12 modules, 222 → 234); 240 → 255
  // for the calc kind and the sandbox's types (cells/calc, kernel/sandbox, issue 17); 255 → 270
  // for tables from a database and fits computed there (cells/table/_parse_database.ts,
  // _read_database.ts, cells/fit/_in_engine*.ts, kernel/engine, kernel/expr/to_sql.ts,
  // kernel/linalg/small_symmetric.ts; issue 18: 249 → 255); 270 → 285 for issue 20's fits
  // (robust fits, cells/fit/_robust*.ts: 5 modules, 269 → 274; worker_startup 51 ms ready);
  // 285 → 297 for the joint kind (cells/joint, issue 20 item 4: 12 modules, 277 → 289);
  // 297 → 309 for the agreement kind (cells/agreement, issue 20 item 1: 12 modules, 291 → 303);
  // 309 → 320 for WebAssembly and the worker's own collection (issue 16: the CSV lane, the
  // decimal corrections and the QR's loops, each bytes and driver; kernel/collect.ts with
  // node:v8 and node:vm: 9 modules, 304 → 313).
  ok(info.modules.length < 320, `${info.modules.length} modules`);
});
