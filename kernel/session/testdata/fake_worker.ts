/** Compute worker entry for kernel tests. @module */
import { serveComputeWorker } from "../../worker/compute_worker.ts";
import { fakeRegistry } from "./fake_kinds.ts";

serveComputeWorker(fakeRegistry);
