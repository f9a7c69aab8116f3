/**
 * Normalises the reader's options: delimiter by name and decimal separator,
 * missing markers, declared types.
 *
 * @module
 */
import { DelimitedError } from "./delimited_error.ts";

/** Options of {@link readDelimited}. */
export interface ReadDelimitedOptions {
  /** The file's name as the user wrote it, for messages (and `.tsv` detection). */
  name?: string;
  /** Field delimiter, one ASCII character; default "\t" for `.tsv`/`.tab`, ";" with a decimal comma, else ",". */
  delimiter?: string;
  /** Decimal separator, "." (default) or ",". */
  decimal?: "." | ",";
  /** Markers of a missing value besides the empty field; default `["NA", "NaN"]`. */
  missing?: readonly string[];
  /** Declared column types, by header name. */
  types?: Readonly<Record<string, "number" | "text">>;
  /** Keep decimal corrections while rows × number columns ≤ this; default 4,000,000. */
  loLimit?: number;
  /** Called now and then with the fraction of the work done. */
  onProgress?: (fraction: number) => void;
  /**
   * Read a large plain file in two halves at once, the second on a helper
   * thread (`_halves.ts`), from this many bytes (default: never). The
   * columns are then in shared memory.
   */
  halvesFrom?: number;
}

/** The reader's default missing-value markers (besides the empty field). */
export const DEFAULT_MISSING: readonly string[] = ["NA", "NaN"];

/** Default of {@link ReadDelimitedOptions.loLimit}: rows × numeric columns. */
export const DEFAULT_LO_LIMIT = 4_000_000;

/** Options with defaults filled in. */
export interface ResolvedOptions {
  label: string;
  delimiter: string;
  delimByte: number;
  decimal: "." | ",";
  missing: readonly string[];
  types: Readonly<Record<string, "number" | "text">>;
  loLimit: number;
  onProgress: ((fraction: number) => void) | null;
  halvesFrom: number;
}

/**
 * Fills defaults: the delimiter is the option, else a tab for `.tsv`/`.tab`
 * names, else `;` with a decimal comma, else `,`.
 *
 * @throws {DelimitedError} For a delimiter that is not one ASCII character,
 *   is a quote or line end, or equals the decimal comma.
 */
export function resolveOptions(options: ReadDelimitedOptions): ResolvedOptions {
  const label = options.name ?? "input";
  const decimal = options.decimal ?? ".";
  const byName = /\.(tsv|tab)$/i.test(label) ? "\t" : undefined;
  const delimiter = options.delimiter ?? byName ?? (decimal === "," ? ";" : ",");
  const code = delimiter.length === 1 ? delimiter.charCodeAt(0) : -1;
  if (code < 0 || code >= 0x80 || code === 0x22 || code === 0x0a || code === 0x0d) {
    throw new DelimitedError(
      `Delimiter ${JSON.stringify(delimiter)} cannot be used: it must be one ASCII character ` +
        `other than a quote or a line end, such as ",", ";" or "\\t"`,
      { option: ["delimiter"] },
    );
  }
  if (decimal === "," && delimiter === ",") {
    throw new DelimitedError(
      `Delimiter "," cannot be used with a decimal comma: use ";" or "\\t" between fields`,
      { option: ["delimiter"] },
    );
  }
  return {
    label,
    delimiter,
    delimByte: code,
    decimal,
    missing: options.missing ?? DEFAULT_MISSING,
    types: options.types ?? {},
    loLimit: options.loLimit ?? DEFAULT_LO_LIMIT,
    onProgress: options.onProgress ?? null,
    halvesFrom: options.halvesFrom ?? Infinity,
  };
}
