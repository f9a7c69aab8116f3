/**
 * A compute worker entry serving {@link withSearch}, for the search's
 * document tests (cells/worker.ts serves the product registry).
 *
 * @module
 */
import { serveComputeWorker } from "../../kernel/worker/compute_worker.ts";
import { withSearch } from "./_registry.ts";

serveComputeWorker(withSearch);
