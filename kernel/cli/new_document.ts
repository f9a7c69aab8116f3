/**
 * What `plumb new` writes: a short analysis with one working cell of each
 * common kind (table, fit, compare, check, predict, chart) and a small data
 * file beside it whose numbers are invented and say so (in the file's name
 * and in the document's first paragraph).
 *
 * The scenario is our own: a bicycle's back tyre with a slow leak, its
 * pressure read every morning for three weeks in an unheated shed. The
 * readings were made up (a loss of about 3 % a day, a small temperature
 * effect, noise of about 0.04 bar, and one reading taken after a ride in
 * the sun); they describe no real tyre.
 *
 * This module is text only: the kernel still knows no kind (the cell kinds
 * named here are the product's, given to the command line by its entry).
 *
 * @module
 */

/** The invented readings (day, bar, °C). */
const READINGS = `day,pressure,temperature
0,6.12,13.1
1,5.92,13.8
2,5.80,16.2
3,5.59,15.8
4,5.50,19.3
5,5.29,18.4
6,5.10,16.0
7,5.00,18.0
9,4.61,13.3
10,4.48,13.8
11,4.33,11.8
12,4.46,10.6
13,3.97,10.8
14,3.89,10.2
16,3.65,10.7
17,3.58,12.8
18,3.42,11.4
19,3.45,14.8
20,3.30,15.9
21,3.22,16.1
`;

/** The two files of a new analysis. */
export interface NewDocument {
  /** The document's text. */
  document: string;
  /** The data file's name, beside the document. */
  dataName: string;
  /** The data file's text. */
  data: string;
}

/**
 * The data file's name for a document: its stem and `-invented.csv`, so
 * two new documents in one folder do not share (or overwrite) data.
 *
 * @param documentName The document's file name (no folder).
 * @returns The data file's name.
 * @example
 * ```ts
 * import { dataNameFor } from "./new_document.ts";
 * if (dataNameFor("leak.md") !== "leak-invented.csv") throw new Error();
 * ```
 */
export function dataNameFor(documentName: string): string {
  const stem = documentName.replace(/\.(md|markdown)$/i, "") || "analysis";
  return `${stem}-invented.csv`;
}

/**
 * The files of a new analysis.
 *
 * @param documentName The document's file name (no folder).
 * @returns The document, its data file's name and the data.
 */
export function newDocument(documentName: string): NewDocument {
  const dataName = dataNameFor(documentName);
  return { document: documentText(dataName), dataName, data: READINGS };
}

function documentText(dataName: string): string {
  const fence = "```";
  return `---
title: A slow leak in the back tyre
confidence: 0.95
---

# A slow leak in the back tyre

_Invented data._ The readings in \`${dataName}\` were made up for this starting document; they
describe no real tyre. Replace them with your own measurements (change \`from:\` below) and every
result follows.

The back tyre was pumped to 6 bar and left in an unheated shed; its pressure was read each morning,
with the shed's temperature. How fast is it losing air, and when will it be too soft to ride (2.5 bar)?

${fence}table readings
from: ${dataName}
units: { day: d, pressure: bar, temperature: °C }
exclude:
  - rows: [12]
    why: read after a ride in the sun, tyre still warm
${fence}

## Three ideas of the leak

A steady leak loses the same pressure every day:

${fence}fit steady
on: readings
model: pressure = p0 - r*day
${fence}

Air escaping through a small hole goes faster when the pressure is higher, so the loss may be a fixed
fraction of what is left each day: the logarithm of the pressure then falls in a straight line.

${fence}fit fraction
on: readings
model: log(pressure) = a - k*day
${fence}

The readings may also follow the shed's temperature (warm air pushes harder), so the third idea adds a
term for it:

${fence}fit warmth
on: readings
model: log(pressure) = a - k*day + c*temperature
${fence}

## Which idea fits better?

${fence}compare leak
fits: [steady, fraction, warmth]
by: aicc
${fence}

The comparison prefers @(leak.preferred); it judges all three on the pressure itself, not on its
logarithm. Before trusting the winner, look at what it leaves over: patterns, unequal spread, or
single readings that decide the answer.

${fence}check warmth-residuals
fit: warmth
${fence}

## When does it need air?

A forecast with \`warmth\` would need a forecast of the weather, so this one uses \`fraction\`: the
pressure expected on days 25 and 30, and the day it is down to 2.5 bar. All three lie beyond the last
reading, and Plumb says so.

${fence}predict pump-day
fit: fraction
at: { day: [25, 30] }
solve: { pressure: 2.5 }
search: [0, 60]
${fence}

${fence}chart over-time
on: readings
x: day
y: pressure
fits: [steady, fraction]
band: fraction
${fence}
`;
}
