/**
 * The contract between the kernel and the cell kinds: the kind record (its
 * compute face and page face), the contexts it is called with, its declared
 * options and their readers, the values kinds exchange and the document
 * settings. The kernel defines it and knows no kind; kinds enter through a
 * {@link Registry} handed to the kernel by an entry point outside it.
 *
 * @module
 */
export type {
  CellKind,
  ColumnInfo,
  PageCopy,
  PageFace,
  ParseContext,
  RunContext,
  StampContext,
  TemplateCell,
  TemplateContext,
  ViewProps,
} from "./kind.ts";
export type {
  CellOutput,
  Column,
  FileData,
  FileRef,
  InputRef,
  NumberColumn,
  OptionPath,
  OutputType,
  Table,
  TableInEngine,
  TextColumn,
} from "./values.ts";
export type { DocSettings } from "./settings.ts";
export type { Change, ChangeContext, HistoryFace, RowChanges, TrendSample } from "./history.ts";
export {
  badOption,
  checkOptionKeys,
  missingOption,
  type OptionDecl,
  type OptionDecls,
  type OptionType,
  readBoolean,
  readCellName,
  readChoice,
  readMapping,
  readNumber,
  shown,
} from "./options.ts";
export { type AnyKind, makeRegistry, type Registry } from "./registry.ts";
