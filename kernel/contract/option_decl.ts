/**
 * A kind's declared options: each once, with its type, default, one line of
 * documentation and what it names (a cell, a column, a file).
 *
 * @module
 */

/** What an option's value is, for the reference documentation. */
export type OptionType =
  | "text"
  | "number"
  | "whole number"
  | "boolean"
  | "choice"
  | "expression"
  | "equation"
  | "mapping"
  | "list"
  | "rows";

/** One declared option. */
export interface OptionDecl {
  /** What the value is. */
  type: OptionType;
  /** One line of documentation. */
  doc: string;
  /** The default as a reader sees it (omitted: none; the option is optional unless `required`). */
  default?: unknown;
  /** The option must be given. */
  required?: boolean;
  /** The value names other cells, columns of the input table, or a file beside the document. */
  names?: "cell" | "cells" | "column" | "columns" | "file";
  /** For a choice: the words it accepts. */
  choices?: readonly string[];
}

/** A kind's options by key. */
export type OptionDecls = Readonly<Record<string, OptionDecl>>;
