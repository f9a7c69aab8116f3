import assert from "node:assert/strict";
import { LocatedError } from "../errors.ts";
import { parseDocument, readSettings } from "./mod.ts";

const settingsOf = (src: string) => readSettings(parseDocument(src));

Deno.test("readSettings() fills defaults without front matter", () => {
  assert.deepEqual(settingsOf("# Just prose\n"), {
    settings: {
      title: "Untitled analysis",
      confidence: 0.95,
      seed: 1,
      criterion: "aicc",
      maxFileBytes: 512 * 1024 * 1024,
      history: 100,
      extra: {},
    },
    errors: [],
  });
});

Deno.test("readSettings() reads every setting and keeps other keys in extra", () => {
  const { settings, errors } = settingsOf(
    "---\ntitle: Fade of batch 7\nconfidence: 0.99\nseed: 42\ncriterion: BIC\nmax_file_size: 2 GiB\nhistory: 12\nauthor: { name: R. Q. }\n---\n",
  );
  assert.deepEqual(errors, []);
  assert.deepEqual(settings, {
    title: "Fade of batch 7",
    confidence: 0.99,
    seed: 42,
    criterion: "bic",
    maxFileBytes: 2 * 1024 ** 3,
    history: 12,
    extra: { author: { name: "R. Q." } },
  });
});

Deno.test("readSettings() reads sizes in decimal and binary units and plain bytes", () => {
  // kB/MB are powers of 1000, KiB/MiB powers of 1024 (IEC 80000-13 unit names).
  const size = (v: string) => settingsOf(`---\nmax_file_size: ${v}\n---\n`).settings.maxFileBytes;
  assert.equal(size("512 MB"), 512e6);
  assert.equal(size("512MiB"), 512 * 2 ** 20);
  assert.equal(size("1.5 kb"), 1500);
  assert.equal(size("1000000"), 1e6);
  assert.equal(size("3 TiB"), 3 * 2 ** 40);
});

Deno.test("readSettings() reports bad values at their front-matter line and keeps defaults", () => {
  const { settings, errors } = settingsOf(
    "---\ntitle: [a]\nconfidence: 95\nseed: 1.5\ncriterion: aiccc\nmax_file_size: 12 XB\n---\n",
  );
  assert.ok(errors.every((e) => e instanceof LocatedError));
  assert.deepEqual(errors.map((e) => [e.message, e.pos.line, e.pos.column]), [
    ['Setting "title" must be text: got a list', 2, 8],
    [
      'Setting "confidence" must be a number between 0 and 1, exclusive: got 95; for 95% write 0.95',
      3,
      13,
    ],
    ['Setting "seed" must be a whole number, 0 or more: got 1.5', 4, 7],
    [
      'Setting "criterion" must be one of aic, aicc, bic, loo: got "aiccc": did you mean "aicc"?',
      5,
      12,
    ],
    [
      'Setting "max_file_size" must be a size such as 512 MB, 2 GiB or a number of bytes: got "12 XB"',
      6,
      16,
    ],
  ]);
  assert.deepEqual([settings.confidence, settings.seed, settings.criterion], [0.95, 1, "aicc"]);
});

Deno.test("readSettings() rejects confidence 0 and 1", () => {
  for (const v of ["0", "1", "-0.5"]) {
    assert.equal(settingsOf(`---\nconfidence: ${v}\n---\n`).errors.length, 1, v);
  }
});

Deno.test("readSettings() places front matter YAML errors in the document", () => {
  const { errors } = settingsOf("\uFEFF---\r\ntitle: ok\r\nseed: [1, 2\r\n---\r\n");
  assert.equal(errors.length >= 1, true);
  assert.match(errors[0].message, /^Front matter is not valid YAML: /);
  assert.equal(errors[0].pos.line, 4);
  const dup = settingsOf("---\nseed: 1\nseed: 2\n---\n").errors;
  assert.deepEqual(dup.map((e) => [e.message, e.pos]), [
    ['Front matter repeats key "seed": each key may appear once', { line: 3, column: 1 }],
  ]);
  const list = settingsOf("---\n- a\n---\n").errors;
  assert.deepEqual(list.map((e) => [e.message, e.pos]), [
    ["Front matter must be a YAML mapping of key: value", { line: 2, column: 1 }],
  ]);
});

Deno.test("readSettings() reads history: a number of records, or off", () => {
  const history = (v: string) => settingsOf(`---\nhistory: ${v}\n---\n`);
  assert.equal(history("off").settings.history, 0);
  assert.equal(history("OFF").settings.history, 0);
  assert.equal(history("false").settings.history, 0);
  assert.equal(history("1").settings.history, 1);
  const bad = history("0");
  assert.equal(bad.settings.history, 100);
  assert.deepEqual(bad.errors.map((e) => [e.message, e.pos.line]), [
    ['Setting "history" must be a whole number from 1 to 100,000, or off: got 0', 2],
  ]);
});

Deno.test("readSettings() reads intervals: one method or a list; an unknown one is refused at its line", () => {
  assert.deepEqual(settingsOf("---\nintervals: [wald, Profile, wald]\n---\n").settings.intervals, [
    "wald",
    "profile",
  ]);
  assert.deepEqual(settingsOf("---\nintervals: bootstrap\n---\n").settings.intervals, [
    "bootstrap",
  ]);
  const { settings, errors } = settingsOf("---\nintervals: [wald, profil]\n---\n");
  assert.equal(settings.intervals, undefined);
  assert.equal(errors.length, 1);
  assert.match(errors[0].message, /interval methods among wald, profile, bootstrap/);
  assert.match(errors[0].message, /profile/);
  assert.equal(errors[0].pos.line, 2);
});
