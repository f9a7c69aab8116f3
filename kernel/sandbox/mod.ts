/**
 * The sandbox for user code: a type check in a child process, then a run in
 * a disposable child process with no permissions, a heap cap and a time
 * limit (DESIGN.md §2). The kernel offers both to kinds through
 * `RunContext.sandbox`; the compute worker, having no permissions, asks the
 * main thread, which starts the processes (kernel/worker/client.ts).
 *
 * @module
 */
export { type CheckAnswer, checkProgram, type Diagnostic, parseDiagnostics } from "./check.ts";
export {
  CONSOLE_LIMIT,
  type IsolateAnswer,
  type IsolateJob,
  type IsolateStop,
  RESULT_LIMIT,
  runIsolated,
  startAhead,
  stopAllIsolated,
} from "./isolate.ts";
export { decodeColumn, encodeData, F64 } from "./data.ts";
