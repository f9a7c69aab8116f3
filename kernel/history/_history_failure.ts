/**
 * A history file that could not be written or read, in one plain sentence:
 * `The run history fade.history.jsonl could not be written: the folder is
 * read-only`. Each file-system step says whether it touched the file or its
 * folder ({@link at}), so a refused permission names the right one.
 *
 * @module
 */
import { basename } from "node:path";

/** The history file could not be written or read; the message is the sentence to show. */
export class HistoryFileError extends Error {
  /**
   * @param message One sentence naming the file and the reason.
   * @param cause The file-system error.
   */
  constructor(message: string, cause?: unknown) {
    super(message, { cause });
    this.name = "HistoryFileError";
  }
}

/** What a step touched: the history file (writing it or reading it), or its folder (creating, renaming). */
export type Where = "file" | "reading" | "folder";

class StepFailure {
  constructor(readonly where: Where, readonly err: unknown) {}
}

/**
 * A failure marked with what its step touched, to throw.
 *
 * @param where What it touched.
 * @param err The file-system error.
 * @returns The marked failure.
 */
export function failedAt(where: Where, err: unknown): unknown {
  return new StepFailure(where, err);
}

/**
 * Runs a file-system step, marking a failure with what it touched.
 *
 * @param where What it touched.
 * @param step The step.
 * @returns Its value.
 */
export async function at<T>(where: Where, step: Promise<T>): Promise<T> {
  try {
    return await step;
  } catch (err) {
    throw new StepFailure(where, err);
  }
}

/**
 * The sentence for a failed write or read of the history file.
 *
 * @param path The history file.
 * @param doing "written" or "read".
 * @param failure What was thrown (marked by {@link at}, or a bare error).
 * @returns The error to throw.
 */
export function historyFailure(
  path: string,
  doing: "written" | "read",
  failure: unknown,
): HistoryFileError {
  const where = failure instanceof StepFailure
    ? failure.where
    : doing === "read"
    ? "reading"
    : "file";
  const err = failure instanceof StepFailure ? failure.err : failure;
  return new HistoryFileError(
    `The run history ${basename(path)} could not be ${doing}: ${reason(err, where)}`,
    err,
  );
}

function reason(err: unknown, where: Where): string {
  const code = (err as { code?: string } | null)?.code;
  if (code === "EROFS") return "the disk is read-only";
  if (code === "ENOSPC" || code === "EDQUOT") return "the disk is full";
  if (err instanceof Deno.errors.NotCapable) {
    return where === "reading"
      ? "this run has no leave to read it"
      : `this run has no leave to write ${where === "file" ? "it" : "in its folder"}`;
  }
  if (err instanceof Deno.errors.PermissionDenied) {
    return where === "reading" ? "no permission to read it" : `the ${where} is read-only`;
  }
  if (err instanceof Deno.errors.IsADirectory) return "a folder of that name is in the way";
  if (err instanceof Deno.errors.NotADirectory) {
    return "a file stands where a folder of its path should be";
  }
  if (err instanceof Deno.errors.NotFound) return "its folder does not exist";
  const text = err instanceof Error ? err.message : String(err);
  return text.replace(/\s*\(os error \d+\).*$/s, "");
}
