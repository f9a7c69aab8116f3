/**
 * What the command line is handed from outside the kernel.
 *
 * @module
 */
import type { Registry } from "../contract/mod.ts";

/**
 * What the command line is given by its entry point (the product's is
 * `cells/main.ts`): the kernel knows no kind, so the kinds come from outside.
 */
export interface Product {
  /** The compute faces. */
  registry: Registry;
  /** The compute worker's entry module (imports the same registry). */
  workerUrl: URL;
  /** The entry module itself, which `serve` relaunches with narrowed permissions. */
  mainUrl: URL;
  /** The live page's entry module, which `serve` bundles for the browser. */
  pageUrl: URL;
  /** The static record's module (`gatherRecord`, `renderRecord`), which `export` loads. */
  recordUrl: URL;
}
