/**
 * The record's provenance: what was run, on what, by what, when, and under
 * which conventions — what a reviewer needs to recompute it or to tell that
 * the data before them is the data that was analysed.
 *
 * @module
 */
import type { VNode } from "preact";
import type { RecordInput } from "./types.ts";

/** Conventions the numbers follow, read from the settings and the results. */
function conventions(input: RecordInput): [string, string][] {
  const s = input.settings;
  const out: [string, string][] = [
    ["Confidence level of intervals", `${s.confidence * 100}%`],
    ["Criterion for comparisons (default)", s.criterion],
    ["Seed for anything random", String(s.seed)],
  ];
  const k = new Set<string>();
  for (const c of input.cells) {
    const r = c.result as { k_convention?: unknown } | null;
    if (r && typeof r.k_convention === "string") k.add(r.k_convention);
  }
  for (const text of k) out.push(["What k counts", text]);
  return out;
}

/**
 * The provenance section.
 *
 * @param props The record input.
 * @returns A `<section class="pl-record-provenance">`.
 */
export function Provenance({ input }: { input: RecordInput }): VNode {
  const { document: d, versions: v, run } = input;
  return (
    <section class="pl-record-provenance" id="provenance">
      <h2>Provenance</h2>
      <table class="pl-table">
        <tbody>
          <tr>
            <th>Document</th>
            <td>
              <code>{d.path}</code> ({d.bytes} bytes)<br />
              SHA-256 <code class="pl-hash">{d.sha256}</code>
            </td>
          </tr>
          {input.files.map((f) => (
            <tr key={f.path}>
              <th>Data file</th>
              <td>
                <code>{f.path}</code>
                <br />SHA-256 <code class="pl-hash">{f.sha256 ?? "not read"}</code>
                {f.tables.map((t) => (
                  <span key={t.cell}>
                    <br />table “{t.cell}”: {t.rowsRead} rows read, {t.rowsUsed} used
                    {t.excluded > 0 ? `, ${t.excluded} excluded with reasons` : ""}
                  </span>
                ))}
              </td>
            </tr>
          ))}
          <tr>
            <th>Run</th>
            <td>
              {run.utc} (UTC){run.ms === null ? "" : `, ${Math.round(run.ms)} ms`}
              {run.reproducible && " — time fixed by SOURCE_DATE_EPOCH, duration not recorded"}
            </td>
          </tr>
          <tr>
            <th>Software</th>
            <td>
              Plumb {v.plumb}; Deno {v.deno} (V8 {v.v8}); {v.os}
            </td>
          </tr>
          {conventions(input).map(([k, text]) => (
            <tr key={k + text}>
              <th>{k}</th>
              <td>{text}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </section>
  );
}
