/**
 * A document in which one name, a built-in property of every plain object
 * (`constructor`, `__proto__`, `toString`, …), is used everywhere a user
 * chooses a name: a column (in a file, inline, derived), a unit, a cell, a
 * parameter (with and without start values and limits), a response, a
 * predictor of `at`, a column to solve for, a chart axis, a front-matter
 * setting and an unknown option. Every kind reads it.
 *
 * @module
 */

const ROWS = [
  [1, 2, 3.1],
  [2, 4.1, 5.2],
  [3, 5.9, 6.9],
  [4, 8.2, 9.1],
  [5, 10, 11.2],
  [6, 12.1, 12.8],
  [7, 13.8, 15.1],
  [8, 16.2, 16.9],
];

/** The data files: `d.csv` has a column named `n`; `p.csv` has `x, y`. */
export function hostileFiles(n: string): Record<string, string> {
  return {
    "d.csv": `x,${n},y\n` + ROWS.map((r) => r.join(",")).join("\n") + "\n",
    "p.csv": "x,y\n" + ROWS.map((r) => `${r[0]},${r[2]}`).join("\n") + "\n",
  };
}

const fence = (info: string, body: string) => "```" + info + "\n" + body.trim() + "\n```\n";

/** Cells that read `n` as a column, unit or parameter name. */
function asColumn(n: string): string[] {
  return [
    fence(
      "table data",
      `from: d.csv\nunits: { x: s, ${n}: m, y: kg }\ntypes: { ${n}: number }\nderive: { z: ${n} * 2 }\nwhere: ${n} > 0`,
    ),
    fence("table plain", `from: p.csv\nunits: { x: ${n}, y: kg }`),
    fence("table inl", `columns: [x, ${n}]\nrows: [[1, 2], [2, 3], [3, 5]]`),
    fence("table der", `from: p.csv\nderive: { ${n}: x * 2 }\nunits: { ${n}: s }`),
    fence("fit colfit", `on: data\nmodel: y = a + b*${n}`),
    fence("fit resp", `on: data\nmodel: ${n} = a + b*x\nweights: 1/x`),
    fence("fit derfit", `on: der\nmodel: y = a + b*${n}\nknown_sigma: 0.1`),
    fence("fit poly", `on: data\nmodel: y = polynomial(${n}, 2)`),
    fence("fit lin", `on: data\nmodel: y = linear(x, ${n})`),
    fence(
      "fit parfit",
      `on: plain\nmodel: y = ${n}*exp(k*x)\nstart: { ${n}: 3, k: 0.2 }\nwithin: { ${n}: [0, null] }`,
    ),
    fence("fit ms", `on: plain\nmodel: y = ${n}*exp(k*x)`),
    fence("fit parlin", `on: plain\nmodel: y = ${n} + b*x`),
  ];
}

/** Cells that read the others, one of them named `n`. */
function asCell(n: string): string[] {
  return [
    fence(`fit ${n}`, "on: plain\nmodel: y = a + b*x\nweights: 1/x"),
    fence("compare cmp", `fits: [${n}, parfit, parlin]\nby: aicc`),
    fence("compare cmp2", "fits: [poly, lin, colfit]"),
    fence("check chk", `fit: ${n}`),
    fence("check chk2", "fit: colfit\nrobust: hc3"),
    fence("check chk4", "fit: lin"),
    fence("check chk5", "fit: parfit"),
    fence("predict pr", `fit: colfit\nat: { ${n}: [1, 2] }\nsolve: { y: 5 }`),
    fence("predict pr2", "fit: parfit\nat: { x: [1, 2] }\nsolve: { y: 5 }"),
    fence("predict pr3", `fit: ${n}\nat: { x: [1] }`),
    fence("predict prs", `fit: resp\nat: { x: [2] }\nsolve: { ${n}: 5 }`),
    fence("chart ch", `on: data\nx: ${n}\ny: y\nfits: [colfit]\nband: colfit`),
    fence("chart ch2", `on: plain\nx: x\ny: y\nfits: [${n}, parfit]\nband: ${n}`),
    fence("chart ch3", `on: data\nx: x\ny: ${n}\nfits: [resp]`),
    fence("fit unk", `on: plain\n${n}: 3\nmodel: y = a + b*x`),
  ];
}

/**
 * The document for one hostile name.
 *
 * @param n The name.
 * @returns The document text; the cell `unk` alone should fail (an unknown option).
 */
export function hostileDocument(n: string): string {
  return `---\ntitle: t\n${n}: 1\n---\n\n` + [...asColumn(n), ...asCell(n)].join("\n") +
    `\nInline @(${n}.r2, 3) and @(parfit.${n}).\n`;
}
