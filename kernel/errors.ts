/**
 * Errors that carry where they happened.
 *
 * Two flavours, because positions are known at different depths:
 *
 * - {@link LocatedError} already knows its line and column in the document
 *   (the document parser raises these).
 * - {@link CellError} knows only the option it concerns (`["exclude", 0, "why"]`)
 *   and, for text options such as a model, the character offset inside that
 *   option's value. The kernel resolves it to a document line and column with
 *   the cell's source map, so cell code (which may run in a worker without the
 *   document) never handles line numbers itself.
 *
 * @module
 */

/** A position in the analysis document; both 1-based, columns count UTF-16 code units. */
export interface SourcePos {
  line: number;
  column: number;
}

/** A path to an option inside a cell's YAML body: keys and list indexes. */
export type OptionPath = readonly (string | number)[];

/** An error with a known document position. */
export class LocatedError extends Error {
  /** Where the error was found. */
  pos: SourcePos;
  /**
   * @param message Sentence case, no final period, offending value quoted.
   * @param pos Line and column in the document (1-based).
   */
  constructor(message: string, pos: SourcePos) {
    super(message);
    this.name = "LocatedError";
    this.pos = pos;
  }
}

/** An error in a cell, placed by option path (and offset inside a text value). */
export class CellError extends Error {
  /** The option the error concerns; empty for the cell as a whole. */
  path: OptionPath;
  /** 0-based character offset inside the option's text value, when known. */
  offset?: number;
  /**
   * @param message Sentence case, no final period, offending value quoted.
   * @param path Option path, e.g. `["model"]`; `[]` means the cell's fence line.
   * @param offset Character offset inside the option's value.
   */
  constructor(message: string, path: OptionPath = [], offset?: number) {
    super(message);
    this.name = "CellError";
    this.path = path;
    this.offset = offset;
  }
}
