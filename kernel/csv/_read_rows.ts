/**
 * Pass 1 over a stretch of data records: plain records by the fast lane
 * (`_plain_rows.ts`), any other record by the general scanner, row by row.
 *
 * ```
 *  from {pos, row} ──lane──▶ … ──a record the lane leaves──▶ scanner.next ──▶ lane … ──▶ until
 * ```
 *
 * @module
 */
import { DelimitedError } from "./delimited_error.ts";
import type { NumberPass } from "./_passes.ts";
import { PlainRows } from "./_plain_rows.ts";
import { Scanner } from "./_scanner.ts";
import type { ResolvedOptions } from "./_options.ts";

/** A place in the data: a record's first byte (or blank lines before one) and its row index. */
export interface Place {
  pos: number;
  row: number;
}

/** Rows between progress reports. */
export const PROGRESS_EVERY = 65536;

/**
 * Reads the records from `from` on, until the end, or until a record would
 * start at or after `until.pos` or be row `until.row`.
 *
 * @param bytes The file.
 * @param o The reader's options (delimiter, file name for messages).
 * @param pass Where the numbers go.
 * @param ncols Fields per record.
 * @param progress Called every {@link PROGRESS_EVERY} rows with the fraction of bytes read.
 * @param from Where to start.
 * @param until Where to stop (default: the end).
 * @returns Where it stopped: the next record's place.
 * @throws {DelimitedError} From the scanner, or for a record with the wrong number of fields.
 */
export function readRows(
  bytes: Uint8Array,
  o: ResolvedOptions,
  pass: NumberPass,
  ncols: number,
  progress: (fraction: number) => void,
  from: Place,
  until: Place = { pos: bytes.length, row: Infinity },
): Place {
  const scanner = new Scanner(bytes, from.pos, o.delimByte, o.label);
  const plain = pass.markersFirst
    ? null
    : new PlainRows(bytes, o.delimByte, pass.markers, pass.parser, ncols, until.pos);
  let r = from.row, report = (Math.floor(r / PROGRESS_EVERY) + 1) * PROGRESS_EVERY;
  for (;;) {
    if (plain !== null) {
      r = plain.read(scanner.pos, r, Math.min(pass.capacity, report, until.row), pass);
      scanner.pos = plain.pos;
    }
    if (r >= report) {
      progress(scanner.progress());
      report += PROGRESS_EVERY;
      continue;
    }
    if (r >= until.row || !moreRecords(bytes, scanner.pos, until.pos)) break;
    const full = r === pass.capacity;
    pass.startRow(r); // grows the columns when they are full
    if (plain !== null && full) continue;
    // A record the fast lane left: the general scanner reads it.
    scanner.row = r + 1;
    const n = scanner.next(pass);
    if (n !== ncols) throw wrongCount(o.label, r + 1, n, ncols);
    r++;
  }
  return { pos: scanner.pos, row: r };
}

/** Whether a record starts between `pos` and `stop` (past any blank lines). */
function moreRecords(bytes: Uint8Array, pos: number, stop: number): boolean {
  while (pos < bytes.length && (bytes[pos] === 0x0a || bytes[pos] === 0x0d)) pos++;
  return pos < Math.min(stop, bytes.length);
}

/**
 * The error for a record with the wrong number of fields.
 *
 * @param label The file's name.
 * @param row The record's row (1-based).
 * @param n Its fields.
 * @param ncols The header's fields.
 * @returns The error, naming the row.
 */
export function wrongCount(label: string, row: number, n: number, ncols: number): DelimitedError {
  return new DelimitedError(
    `File "${label}": row ${row} has ${n} field${n === 1 ? "" : "s"}, expected ${ncols} ` +
      `as in the header`,
    { row },
  );
}
