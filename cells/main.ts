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
import { main } from "../kernel/cli/main.ts";
import { registry } from "./mod.ts";

/** The compute worker's entry module. */
export const WORKER_URL: URL = new URL("./worker.ts", import.meta.url);

/** The live page's entry module. */
export const PAGE_URL: URL = new URL("../ui/main.tsx", import.meta.url);

/** The static record's module (loaded by `plumb export` only). */
export const RECORD_URL: URL = new URL("../ui/record/mod.ts", import.meta.url);

if (import.meta.main) {
  const mainUrl = new URL(import.meta.url);
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
