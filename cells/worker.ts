/**
 * The product's compute worker entry. Started with no permissions by the
 * kernel; imports the compute registry statically because a permission-less
 * worker cannot import modules dynamically. Its module graph holds the
 * kinds' compute faces and the kernel's numerics only: no view, no drawing
 * library (test/architecture/imports_test.ts checks).
 *
 * @module
 */
import { serveComputeWorker } from "../kernel/worker/compute_worker.ts";
import { registry } from "./mod.ts";

serveComputeWorker(registry);
