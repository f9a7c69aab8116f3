/**
 * Writes the awkward-document corpus byte for byte. Run from the repository
 * root: `deno run --allow-write test/corpus/documents/_generate.ts`.
 *
 * The files end in `.txt` rather than `.md` so that `deno fmt` never
 * reformats them (the parser does not care about the extension).
 *
 * The files are committed; `test/corpus/.gitattributes` (`* -text`) stops git
 * from normalising their line endings. `kernel/document/corpus_test.ts`
 * checks that the files on disk still equal these strings, that they round
 * trip, and that each one has the cells listed here.
 *
 * The documents are invented for testing; no data in them is real.
 *
 * @module
 */

/** One corpus document: its text and what the parser must find in it. */
export interface CorpusDoc {
  file: string;
  text: string;
  /** Cell names in order. */
  cells: string[];
  /** Number of structural errors (unclosed fences, unclosed front matter). */
  errors: number;
  /** Whether the document has front matter. */
  frontMatter: boolean;
}

const F = "`".repeat(3);
const BOM = "\uFEFF";
const lf = (lines: string[]) => lines.join("\n");
const crlf = (lines: string[]) => lines.join("\r\n");

/** The corpus. */
export const CORPUS: CorpusDoc[] = [
  {
    file: "bom.txt",
    text: BOM + lf(["---", "title: With a BOM", "---", "", `${F}table t`, "from: t.csv", F, ""]),
    cells: ["t"],
    errors: 0,
    frontMatter: true,
  },
  {
    file: "crlf.txt",
    text: crlf([
      "# Calibration",
      "",
      `${F}table std`,
      "from: std.csv",
      F,
      "",
      `${F}fit lin`,
      "on: std",
      "model: y = a + b*x",
      F,
      "",
    ]),
    cells: ["std", "lin"],
    errors: 0,
    frontMatter: false,
  },
  {
    file: "mixed-endings.txt",
    text: "Intro line\r\nsecond\rthird\n\n" + `${F}fit a\r\non: t\nmodel: y = k*x\r${F}\n\r\n` +
      `${F}check a-res\rfit: a\r${F}\r\n`,
    cells: ["a", "a-res"],
    errors: 0,
    frontMatter: false,
  },
  {
    file: "tabs.txt",
    text: lf([
      "Prose\twith\ttabs.",
      "",
      "\t```not a fence (indented by a tab)",
      "",
      `${F}table tabbed`,
      "from:\tdata.tsv",
      "units: {x:\tmm}",
      `${F}\t \t`,
      "",
    ]),
    cells: ["tabbed"],
    errors: 0,
    frontMatter: false,
  },
  {
    file: "no-trailing-newline.txt",
    text: lf(["---", "seed: 7", "---", "Last line has no newline and ends in prose"]),
    cells: [],
    errors: 0,
    frontMatter: true,
  },
  {
    file: "nested-fences.txt",
    text: lf([
      "How to write a cell:",
      "",
      "`````markdown",
      `${F}fit shown-not-run`,
      "on: t",
      F,
      "`````",
      "",
      "````",
      `${F}python`,
      "print(1)",
      F,
      "````",
      "",
      `${F}fit real`,
      "on: t",
      "```` this line is body: a closing fence has no info string",
      F,
      "",
    ]),
    cells: ["real"],
    errors: 0,
    frontMatter: false,
  },
  {
    file: "tilde-fences.txt",
    text: lf([
      "~~~table t",
      "from: t.csv",
      "~~~",
      "",
      "~~~~ text",
      "~~~fit inner",
      "~~~",
      "~~~~",
      "",
      "~~~fit f",
      "note: ``` inside a tilde fence",
      "~~~~~",
      "",
    ]),
    cells: ["t", "f"],
    errors: 0,
    frontMatter: false,
  },
  {
    file: "indented-fences.txt",
    text: lf([
      "   ```table t",
      "   from: t.csv",
      "  ```",
      "",
      " ~~~fit f",
      " on: t",
      "    ~~~ (four spaces: still body)",
      "~~~",
      "",
      "    ```fit code-block-not-cell",
      "    ```",
      "",
    ]),
    cells: ["t", "f"],
    errors: 0,
    frontMatter: false,
  },
  {
    file: "unclosed-fence.txt",
    text: lf([
      "Intro",
      "",
      `${F}fit line`,
      "on: t",
      "model: y = a + b*x",
      "",
      `${F}fit root`,
      "on: t",
      F,
      "",
      "Tail",
      "",
    ]),
    cells: ["line", "root"],
    errors: 1,
    frontMatter: false,
  },
  {
    file: "empty-body.txt",
    text: lf([`${F}calc nothing`, F, "", `${F}table blank`, "", F, ""]),
    cells: ["nothing", "blank"],
    errors: 0,
    frontMatter: false,
  },
  {
    file: "front-matter-only.txt",
    text: lf(["---", "title: Only settings", "confidence: 0.99", "---", ""]),
    cells: [],
    errors: 0,
    frontMatter: true,
  },
  {
    file: "no-front-matter.txt",
    text: lf([
      "# Heading",
      "",
      "---",
      "",
      "A thematic break above, not front matter.",
      "",
      `${F}table t`,
      "from: t.csv",
      F,
      "",
    ]),
    cells: ["t"],
    errors: 0,
    frontMatter: false,
  },
  {
    file: "unicode-prose.txt",
    text: lf([
      "---",
      "title: Étalonnage — 校准 😀",
      "---",
      "Ångström-scale drift, µg/L, σ² and 𝛽 (astral), emoji 🧪 before @(fit-α.r2)? No: names are ASCII.",
      "",
      `${F}fit dérive`,
      "Not a cell: the name is not ASCII.",
      F,
      "",
      `${F}fit drift`,
      "model: y = a·x  # a middle dot is text in a comment",
      F,
      "Result: @(drift.r2, 3) — 😀 after.",
      "",
    ]),
    cells: ["drift"],
    errors: 0,
    frontMatter: true,
  },
  {
    file: "long-lines.txt",
    text: lf([
      "x".repeat(20000) + " @(t.rows)",
      "",
      `${F}table t`,
      "note: " + "y".repeat(30000),
      F,
      "",
    ]),
    cells: ["t"],
    errors: 0,
    frontMatter: false,
  },
  {
    file: "cell-at-eof.txt",
    text: lf(["Text", "", `${F}fit last`, "on: t", F]),
    cells: ["last"],
    errors: 0,
    frontMatter: false,
  },
  {
    file: "yaml-features.txt",
    text: lf([
      `${F}fit power`,
      "# a comment line",
      "on: cycles   # trailing comment",
      "start: &s { q0: 2500, a: 1, b: 0.7 }",
      "again: *s",
      "model: >",
      "  capacity = q0 - a*cycle^b",
      "exclude:",
      "  - rows: [41, 42]",
      '    why: "thermocouple \\"loose\\""',
      "  - { rows: [7], why: 'operator''s note' }",
      F,
      "",
    ]),
    cells: ["power"],
    errors: 0,
    frontMatter: false,
  },
  {
    file: "crlf-bom.txt",
    text: BOM +
      crlf([
        "---",
        "title: Windows file",
        "criterion: bic",
        "---",
        "",
        `${F}table w`,
        "from: w.csv",
        F,
        "",
        "End without newline",
      ]),
    cells: ["w"],
    errors: 0,
    frontMatter: true,
  },
  {
    file: "lone-cr.txt",
    text: ["Old line endings", "", `${F}table cr`, "from: cr.csv", "units: { t: s }", F, ""].join(
      "\r",
    ),
    cells: ["cr"],
    errors: 0,
    frontMatter: false,
  },
  { file: "empty.txt", text: "", cells: [], errors: 0, frontMatter: false },
  {
    file: "open-fence-at-eof.txt",
    text: lf(["Prose", "", `${F}fit dangling`]),
    cells: ["dangling"],
    errors: 1,
    frontMatter: false,
  },
  {
    file: "backtick-info.txt",
    text: lf([
      "``` fit `x` is inline code, not a fence",
      "",
      `${F} fit  spaced \t`,
      "on: t",
      F,
      "",
      `${F}fit a b`,
      "three words: prose",
      F,
      "",
    ]),
    cells: ["spaced"],
    errors: 0,
    frontMatter: false,
  },
  {
    file: "unclosed-front-matter.txt",
    text: lf(["---", "title: never closed", "", `${F}table t`, "from: t.csv", F, ""]),
    cells: ["t"],
    errors: 1,
    frontMatter: false,
  },
  {
    file: "unclosed-prose-fence.txt",
    text: lf([
      "Before",
      "",
      `${F}python`,
      "print('never closed')",
      "",
      `${F}table t`,
      "from: t.csv",
      F,
      "",
    ]),
    cells: ["t"],
    errors: 1,
    frontMatter: false,
  },
];

if (import.meta.main) {
  const dir = new URL("./", import.meta.url);
  for (const doc of CORPUS) {
    await Deno.writeFile(new URL(doc.file, dir), new TextEncoder().encode(doc.text));
  }
  console.log(`wrote ${CORPUS.length} documents`);
}
