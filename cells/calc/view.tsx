/**
 * The `calc` block: what the code returned, read the way the other blocks
 * read, and what it printed, folded. The same component renders in the live
 * page and in the static record (no scripts, no state).
 *
 * ```
 *  value                                   shown as
 *  ─────                                   ────────
 *  42, "ok", { cycle: 461.2, u: 0.92 }  ─▶ named values: name · value · how prose shows it
 *  [{ x: 1, y: 2 }, { x: 2, y: 4 }, …]  ─▶ rows: one column per field (the first 100 rows)
 *  anything else                        ─▶ the JSON, indented (cut past 20,000 characters)
 *  gives: table                         ─▶ its size and columns (unit, missing values)
 *  console                              ─▶ a closed disclosure under the value
 * ```
 *
 * Numbers read as an inline value shows them (`formatValue`, six significant
 * digits, a true minus, powers of ten written out), so the block and the
 * prose agree; each number's full value is its title.
 *
 * @module
 */
import type { ComponentChildren, VNode } from "preact";
import type { PageFace, ViewProps } from "../../kernel/contract/mod.ts";
import { formatValue } from "../../kernel/document/inline_value.ts";
import type { TableResult } from "../table/summary.ts";
import type { CalcResult } from "./result.ts";

/** Longest JSON shown whole on the page (characters); longer values are cut with a note. */
const SHOW_CHARS = 20_000;
/** Most fields shown as named values, and most columns of rows. */
const MAX_FIELDS = 40;
/** Rows of a list of records shown (the rest are counted). */
const MAX_ROWS = 100;
/** Longest text of a field that is not a single value (compact JSON) in the named values. */
const FIELD_CHARS = 80;
/** A name prose can walk to (kernel/document/inline_refs.ts: a field's shape). */
const FIELD_NAME = /^[A-Za-z_][A-Za-z0-9_-]*$/;

type Scalar = number | string | boolean | null;

function isScalar(v: unknown): v is Scalar {
  return v === null || typeof v === "number" || typeof v === "string" || typeof v === "boolean";
}

function isRecord(v: unknown): v is Record<string, unknown> {
  return v !== null && typeof v === "object" && !Array.isArray(v);
}

/** A number as prose shows it; other values in words a reader expects. */
function Shown({ v }: { v: Scalar }): VNode {
  if (typeof v === "number") return <span title={String(v)}>{formatValue(v, null)}</span>;
  if (v === null) return <span class="pl-muted" title="null">—</span>;
  return <>{String(v)}</>;
}

/** The inline value that shows a field, or null when prose cannot name it. */
function inlineFor(name: string, path: string | null): string | null {
  if (path === null) return `@(${name})`;
  return FIELD_NAME.test(path) ? `@(${name}.value.${path})` : null;
}

/** A field that holds more than one value, as compact JSON, cut. */
function compact(v: unknown): string {
  const text = JSON.stringify(v) ?? "null";
  return text.length <= FIELD_CHARS ? text : `${text.slice(0, FIELD_CHARS - 1)}…`;
}

/**
 * The value's fields as named values: a single value, or a record of at
 * most {@link MAX_FIELDS} fields of which at least one is a single value.
 */
function namedValues(v: unknown): [string | null, unknown][] | null {
  if (isScalar(v)) return [[null, v]];
  if (!isRecord(v)) return null;
  const entries = Object.entries(v);
  if (entries.length === 0 || entries.length > MAX_FIELDS) return null;
  return entries.some(([, x]) => isScalar(x)) ? entries : null;
}

function NamedValues({ name, entries }: { name: string; entries: [string | null, unknown][] }) {
  return (
    <table class="plumb-calc-named">
      <thead>
        <tr>
          <th scope="col">Name</th>
          <th scope="col">Value</th>
          <th scope="col" class="plumb-calc-inline">In prose</th>
        </tr>
      </thead>
      <tbody>
        {entries.map(([k, x]) => {
          const inline = isScalar(x) ? inlineFor(name, k) : null;
          return (
            <tr key={k ?? ""}>
              <th scope="row">
                <code>{k ?? "value"}</code>
              </th>
              <td>{isScalar(x) ? <Shown v={x} /> : <code>{compact(x)}</code>}</td>
              <td class="plumb-calc-inline">{inline === null ? "—" : <code>{inline}</code>}</td>
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}

/** The field names when the value is a list of records with the same single-value fields. */
function rowFields(v: unknown): string[] | null {
  if (!Array.isArray(v) || v.length === 0 || !isRecord(v[0])) return null;
  const keys = Object.keys(v[0]);
  if (keys.length === 0 || keys.length > MAX_FIELDS) return null;
  const same = v.every((row) =>
    isRecord(row) && Object.keys(row).length === keys.length &&
    keys.every((k) => Object.hasOwn(row, k) && isScalar(row[k]))
  );
  return same ? keys : null;
}

function Rows({ name, keys, rows }: { name: string; keys: string[]; rows: unknown[] }): VNode {
  const shown = rows.slice(0, MAX_ROWS) as Record<string, Scalar>[];
  const first = keys.find((k) => FIELD_NAME.test(k));
  return (
    <>
      <table class="plumb-calc-rows">
        <thead>
          <tr>
            <th scope="col">Index</th>
            {keys.map((k) => <th scope="col" key={k}>{k}</th>)}
          </tr>
        </thead>
        <tbody>
          {shown.map((row, i) => (
            <tr key={i}>
              <td class="pl-muted">{i}</td>
              {keys.map((k) => (
                <td key={k}>
                  <Shown v={row[k]} />
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
      <Note>
        {rows.length > shown.length
          ? `The first ${shown.length} of ${rows.length.toLocaleString("en")} rows. `
          : ""}
        {first !== undefined && (
          <>
            In prose: <code>@({name}.value[0].{first})</code>.
          </>
        )}
      </Note>
    </>
  );
}

function Note({ children }: { children: ComponentChildren }): VNode {
  return <p class="pl-note plumb-calc-note">{children}</p>;
}

function Json({ value }: { value: unknown }): VNode {
  const text = JSON.stringify(value, null, 2) ?? "null";
  const cut = text.length > SHOW_CHARS;
  return (
    <>
      <pre class="plumb-calc-json">{cut ? text.slice(0, SHOW_CHARS) : text}</pre>
      {cut && <Note>Shown in part: {text.length.toLocaleString("en")} characters in all.</Note>}
    </>
  );
}

function Value({ name, value }: { name: string; value: unknown }): VNode {
  const named = namedValues(value);
  if (named !== null) return <NamedValues name={name} entries={named} />;
  const keys = rowFields(value);
  if (keys !== null) return <Rows name={name} keys={keys} rows={value as unknown[]} />;
  return <Json value={value} />;
}

function plural(n: number, word: string): string {
  return `${n.toLocaleString("en")} ${word}${n === 1 ? "" : "s"}`;
}

/** A table the cell gives: what other cells read (its rows and columns). */
function GivenTable({ name, t }: { name: string; t: TableResult }): VNode {
  return (
    <>
      <p class="plumb-calc-gives">
        A table of {plural(t.rows_used, "row")} and {plural(t.columns.length, "column")}{" "}
        for other cells to read (<code>on: {name}</code>).
      </p>
      <table class="plumb-calc-columns">
        <thead>
          <tr>
            <th scope="col">Column</th>
            <th scope="col">Unit</th>
            <th scope="col">Missing values</th>
          </tr>
        </thead>
        <tbody>
          {t.columns.map((c) => (
            <tr key={c.name}>
              <th scope="row">
                <code>{c.name}</code>
              </th>
              <td>{c.unit ?? "—"}</td>
              <td>{c.missing}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </>
  );
}

/** What the code printed, folded: a closed disclosure that says how much is inside. */
function Console({ r }: { r: CalcResult }): VNode | null {
  if (r.console === "" && r.console_cut === 0) return null;
  const lines = r.console === "" ? 0 : r.console.replace(/\n$/, "").split("\n").length;
  const cut = r.console_cut > 0 ? `, ${plural(r.console_cut, "more line")} not kept` : "";
  return (
    <details class="plumb-calc-console">
      <summary>Printed by the code ({plural(lines, "line")}{cut})</summary>
      <pre>{r.console}</pre>
    </details>
  );
}

/**
 * The calc cell's view.
 *
 * @param props The cell's name and its {@link CalcResult}.
 * @returns The block's content.
 * @example
 * ```ts
 * import { renderToString } from "preact-render-to-string";
 * import { CalcView } from "./view.tsx";
 * const html = renderToString(CalcView({ name: "eol", result: {
 *   value: { cycle: 812.34567 }, gives: "value", table: null, console: "hello\n", console_cut: 0, run_ms: 40 } }));
 * if (!html.includes("@(eol.value.cycle)") || !html.includes(">812.346<")) throw new Error(html);
 * ```
 */
export function CalcView({ name, result: r }: ViewProps<CalcResult>): VNode {
  return (
    <section class="plumb-calc" aria-label={`Calc ${name}`}>
      {r.table !== null
        ? <GivenTable name={name} t={r.table} />
        : <Value name={name} value={r.value} />}
      <Console r={r} />
    </section>
  );
}

/** The `calc` kind's page face: its view, for the live page and the record. */
export const calcPage: PageFace<CalcResult, VNode> = { kind: "calc", view: CalcView };
