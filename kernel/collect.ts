/**
 * A full garbage collection of this thread's heap, on demand.
 *
 * A one-shot run lets go of a large data file's bytes once the cells reading
 * it have settled (`SessionOptions.once`), but the main thread allocates
 * almost nothing afterwards, so its collector would not run before the end
 * of the run and the memory would stay resident beside every fit's arrays
 * (a million-row CSV: 137 MB of the run's peak). The engine's own `gc`
 * function is exposed once through `node:v8` and taken from a fresh
 * `node:vm` context (common practice, no source); where that fails, nothing
 * is collected early.
 *
 * @module
 */
let gc: (() => void) | null | undefined;

/**
 * Collects garbage now, when the engine lets us. `node:v8` and `node:vm` are
 * loaded at the first call, not with the module: the compute worker imports
 * this and most runs never collect (loading them with the worker cost its
 * start-up about 20 ms).
 *
 * @returns Whether a collection ran.
 */
export async function collectGarbage(): Promise<boolean> {
  if (gc === undefined) {
    try {
      const { setFlagsFromString } = await import("node:v8");
      const { runInNewContext } = await import("node:vm");
      setFlagsFromString("--expose-gc");
      const f = runInNewContext("gc");
      gc = typeof f === "function" ? f as () => void : null;
    } catch {
      gc = null;
    }
  }
  if (gc === null) return false;
  gc();
  return true;
}
