/**
 * The oracle: what counts as a defect, and where in the project it broke.
 *
 * An input passes when the code under test returns, or throws the project's
 * own located error (LocatedError with a line and column, CellError with an
 * option path, ExprError with an offset inside the text, DelimitedError with
 * a row, column, byte offset or option), within the time limit. Everything
 * else is a {@link Defect}:
 *
 * | kind      | what happened                                                   |
 * | --------- | --------------------------------------------------------------- |
 * | uncaught  | any other exception escaped (TypeError, RangeError: stack, …)   |
 * | unlocated | the project's error, but its place is missing or out of range   |
 * | internal  | a cell or document answered "Internal error" / worker stopped   |
 * | lost      | a round trip changed the text (parse → write, format → parse)   |
 * | slow      | over the per-input limit twice in a row                         |
 * | hang      | no answer before the watchdog killed the child process          |
 * | crash     | the child process died (heap exhausted, abort)                  |
 *
 * @module
 */

/** The kinds of defect, as in the table above. */
export type DefectKind = "uncaught" | "unlocated" | "internal" | "lost" | "slow" | "hang" | "crash";

/** An oracle violation found while checking one input. */
export class Defect extends Error {
  /** What kind of defect. */
  kind: DefectKind;
  /** The first project frame outside the fuzz suite, e.g. `kernel/expr/_parser.ts:88`. */
  where: string;
  /**
   * @param kind What kind of defect.
   * @param message What happened, with the offending error's name and message.
   * @param where Where it broke (a project file and line), or "" when unknown.
   */
  constructor(kind: DefectKind, message: string, where = "") {
    super(message);
    this.name = "Defect";
    this.kind = kind;
    this.where = where;
  }
}

const ROOT = new URL("../../", import.meta.url).href;

/**
 * The first stack frame inside the project folder but outside the fuzz suite
 * (a dependency under node_modules counts: an overflow inside the yaml
 * package is placed there).
 *
 * @param stack An error's stack text.
 * @returns `path:line (function)` relative to the project, or "".
 */
export function projectFrame(stack: string | undefined): string {
  for (const line of (stack ?? "").split("\n").slice(1)) {
    const at = line.indexOf(ROOT);
    if (at < 0) continue;
    const m = /^([^:)]+):(\d+):\d+/.exec(line.slice(at + ROOT.length));
    if (!m || m[1].startsWith("test/fuzz/")) continue;
    const fn = /^\s*at (?:async )?([^\s(]+) \(/.exec(line)?.[1];
    return `${m[1]}:${m[2]}${fn ? ` (${fn})` : ""}`;
  }
  return "";
}

/**
 * Turns an unexpected throw into a Defect (a Defect passes through).
 *
 * @param err What was thrown.
 * @param during What was being called, e.g. "parseModel".
 * @returns The defect to throw.
 */
export function uncaught(err: unknown, during: string): Defect {
  if (err instanceof Defect) return err;
  if (!(err instanceof Error)) return new Defect("uncaught", `${during} threw ${String(err)}`);
  const text = `${during} threw ${err.name}: ${err.message.slice(0, 300)}`;
  return new Defect("uncaught", text, projectFrame(err.stack));
}

/**
 * Fails with an "unlocated" defect unless `ok`.
 *
 * @param ok The condition.
 * @param what What is wrong, with the error's message.
 * @throws {Defect} When not ok.
 */
export function located(ok: boolean, what: string): void {
  if (!ok) throw new Defect("unlocated", what);
}

/**
 * Checks a document position: whole numbers, line within the document.
 *
 * @param pos The position reported.
 * @param lines The document's line count.
 * @param message The error's message, for the report.
 * @throws {Defect} When the position is missing or out of range.
 */
export function checkPos(
  pos: { line: number; column: number } | null | undefined,
  lines: number,
  message: string,
): void {
  const ok = pos != null && Number.isInteger(pos.line) && Number.isInteger(pos.column) &&
    pos.line >= 1 && pos.line <= lines && pos.column >= 1;
  located(ok, `Error placed at ${JSON.stringify(pos)} of ${lines} lines: ${message.slice(0, 200)}`);
}

/**
 * The short name of a defect for matching known ones: target, kind, error
 * name and project file (no line number, so an edit nearby keeps it).
 *
 * @param target The target's name.
 * @param d The defect.
 * @returns E.g. `expr/uncaught/RangeError@kernel/expr/_parser.ts`; without a
 *   frame, the message's start with quoted text and numbers as `#`.
 */
export function signature(target: string, d: { kind: string; message: string; where: string }) {
  const name = /threw (\w+)/.exec(d.message)?.[1] ?? "";
  const file = d.where.split(":")[0];
  if (file || name) return `${target}/${d.kind}${name ? `/${name}` : ""}${file ? `@${file}` : ""}`;
  const stem = d.message.replace(/"[^"]*"|\d+/g, "#").slice(0, 48);
  return `${target}/${d.kind}/${stem}`;
}
