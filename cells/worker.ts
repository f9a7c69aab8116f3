/**
 * The product's compute worker entry. Started with no permissions by the
 * kernel; imports the registry statically because a permission-less worker
 * cannot import modules dynamically.
 *
 * @module
 */
import { serveComputeWorker } from "../kernel/worker/compute_worker.ts";
import { liveResult } from "../kernel/server/live_result.ts";
import { pageOmits } from "../ui/page_fields.ts";
import { registry } from "./mod.ts";

serveComputeWorker(registry, {
  pageShaper: liveResult,
  pageLeavesOut: (kind, keep) => new Set(pageOmits(kind).filter((f) => !keep.has(f))),
});
