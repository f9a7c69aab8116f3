import { deepEqual, equal } from "node:assert/strict";
import { ComputeWorker } from "./client.ts";
import type { WorkerJob } from "./client.ts";

const WORKER = new URL("../session/testdata/fake_worker.ts", import.meta.url);

const SETTINGS = {} as WorkerJob["settings"];

/** A job of the test kinds (kernel/session/testdata/fake_kinds.ts). */
function job(kind: string, key: string, spec: unknown, inputs: Record<string, string> = {}) {
  return { key, kind, name: key, spec, settings: SETTINGS, inputs, files: {} };
}

async function withWorker(fn: (w: ComputeWorker) => Promise<void>): Promise<void> {
  const w = new ComputeWorker(WORKER);
  try {
    await fn(w);
  } finally {
    w.close();
  }
}

Deno.test("ComputeWorker.run() says computed only when the kind's run was called", async () => {
  await withWorker(async (w) => {
    const a = await w.run(job("num", "ka", { value: 3 }));
    deepEqual([a.ok, a.computed, a.summary], [true, true, { value: 3 }]);
    // An input the worker lacks: answered without computing.
    const missing = await w.run(job("sum", "kb", { of: ["x"] }, { x: "absent" }));
    deepEqual([missing.ok, missing.computed], [false, false]);
    equal(missing.error?.message, 'Input "x" is not computed');
    // A cell that throws was computed all the same.
    const refused = await w.run(job("peek", "kp", { path: "/etc/hostname" }));
    deepEqual([refused.ok, refused.computed], [false, true]);
    // Summarising a kept output again computes nothing.
    const again = await w.summarize({ key: "ka", kind: "num", spec: { value: 3 }, page: [] });
    deepEqual([again.ok, again.computed], [true, false]);
  });
});

Deno.test("ComputeWorker.run() with page returns the page copy as the worker's JSON text", async () => {
  await withWorker(async (w) => {
    const a = await w.run({ ...job("num", "ka", { value: 3 }), page: [] });
    deepEqual([a.ok, a.summaryJson, a.summary], [true, '{"value":3}', undefined]);
    const b = await w.run({ ...job("sum", "kb", { of: ["a"] }, { a: "ka" }), page: [] });
    equal(b.summaryJson, '{"value":3}');
  });
});

Deno.test("ComputeWorker.cancelQueued() answers a run not yet started as cancelled and not computed", async () => {
  await withWorker(async (w) => {
    await w.run(job("num", "warm", { value: 0 })); // the worker is up
    const busy = w.run(job("spin", "ks", { ms: 150, tag: 1 }));
    const queued = w.run(job("num", "kq", { value: 2 }));
    w.cancelQueued(new Set(["kq"]));
    const [s, q] = await Promise.all([busy, queued]);
    deepEqual([s.ok, s.computed], [true, true]);
    deepEqual([q.ok, q.computed, q.error?.cancelled], [false, false, true]);
  });
});

Deno.test("ComputeWorker.retain() sent while a run waits in the queue keeps that run's output when listed", async () => {
  await withWorker(async (w) => {
    const busy = w.run(job("spin", "ks", { ms: 200, tag: 4 }));
    const queued = w.run(job("num", "kn", { value: 2 }));
    // Sent before either answered: "kn" is listed, so its output must stay when it arrives.
    w.retain(["ks", "kn"], []);
    await busy;
    await queued;
    const b = await w.run(job("sum", "kb", { of: ["a", "b"] }, { a: "ks", b: "kn" }));
    deepEqual([b.ok, b.summary], [true, { value: 6 }]);
  });
});

Deno.test("ComputeWorker.run() with letGo: the worker drops the file after the run; a later reader sends it again", async () => {
  await withWorker(async (w) => {
    const bytes = new TextEncoder().encode("abcde");
    const file = { path: "d.txt", bytes, sha256: "sha-of-abcde" };
    const read = (key: string, letGo?: string[]) =>
      w.run({
        ...job("bytes", key, { from: "d.txt" }),
        files: { "d.txt": file },
        ...(letGo ? { letGo } : {}),
      });
    const first = await read("k1", ["sha-of-abcde"]);
    deepEqual([first.ok, first.summary], [true, { value: 5 }]);
    // Dropped in the worker and forgotten here: sent again with the next run that reads it.
    const second = await read("k2");
    deepEqual([second.ok, second.summary], [true, { value: 5 }]);
  });
});
