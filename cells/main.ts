/**
 * The `plumb` command's entry point: hands the product's kinds (the compute
 * registry and its worker entry) to the kernel's command line, which knows
 * no kind of its own.
 *
 * ```sh
 * deno task plumb run examples/fade/fade.md --json
 * ```
 *
 * @module
 */
import { relaunchEarly } from "../kernel/cli/run_args.ts";

/** The compute worker's entry module. */
export const WORKER_URL: URL = new URL("./worker.ts", import.meta.url);

/** The live page's entry module. */
export const PAGE_URL: URL = new URL("../ui/main.tsx", import.meta.url);

/** The static record's module (loaded by `plumb export` only). */
export const RECORD_URL: URL = new URL("../ui/record/mod.ts", import.meta.url);

if (import.meta.main) {
  const mainUrl = new URL(import.meta.url);
  // A `plumb run` that will start itself again does so before loading the kinds (run_args.ts).
  const early = await relaunchEarly(Deno.args, mainUrl);
  if (early !== null) Deno.exit(early);
  const [{ main }, { registry }] = await Promise.all([
    import("../kernel/cli/main.ts"),
    import("./mod.ts"),
  ]);
  Deno.exit(
    await main(Deno.args, {
      registry,
      workerUrl: WORKER_URL,
      mainUrl,
      pageUrl: PAGE_URL,
      recordUrl: RECORD_URL,
    }),
  );
}
