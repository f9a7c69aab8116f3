import { equal, throws } from "node:assert/strict";
import { registry } from "../../cells/mod.ts";
import {
  deleteCell,
  EditError,
  newCell,
  restoreCell,
  saveCell,
} from "../../kernel/server/edits.ts";

const F = "```";
const SRC = `---\ntitle: T\n---\n\nIntro.\r\n\n${F}table t\nfrom: a.csv\n${F}\n\nMiddle.\n\n` +
  `~~~fit f\non: t\nmodel: y = a + b*x\n~~~\n\nEnd.\n`;

Deno.test("saveCell() changes only the bytes of that cell's body", () => {
  const out = saveCell(SRC, "f", "on: t\nmodel: y = b*x\n").source;
  const old = "on: t\nmodel: y = a + b*x\n";
  const at = SRC.indexOf(old);
  equal(out.slice(0, at), SRC.slice(0, at));
  equal(out.slice(at + "on: t\nmodel: y = b*x\n".length), SRC.slice(at + old.length));
});

Deno.test("saveCell() refuses an unknown cell with 404 and a fence-closing body with 400", () => {
  throws(() => saveCell(SRC, "ff", "x"), (e) => {
    equal(e instanceof EditError && e.status, 404);
    equal((e as Error).message, `No cell named "ff": did you mean "f"?`);
    return true;
  });
  throws(() => saveCell(SRC, "f", "on: t\n~~~\n"), (e) => {
    equal(e instanceof EditError && e.status, 400);
    equal(
      (e as Error).message,
      `Cannot replace the body of "f": line 2 of the new body would close its ~~~ fence`,
    );
    return true;
  });
});

Deno.test("newCell() inserts the kind's default template naming the last table", () => {
  const out = newCell(SRC, { after: "t", kind: "fit", name: "g" }, registry).source;
  equal(
    out.includes(`${F}table t\nfrom: a.csv\n${F}\n\n${F}fit g\non: t\nmodel: y = a + b*x\n`),
    true,
  );
  throws(
    () => newCell(SRC, { after: null, kind: "fit", name: "f" }, registry),
    (e) => e instanceof EditError && e.status === 400 && /has that name/.test(e.message),
  );
});

Deno.test("deleteCell() then restoreCell() at the returned offset gives back the text exactly", () => {
  for (const name of ["t", "f"]) {
    const d = deleteCell(SRC, name);
    equal(restoreCell(d.source, d.removed, d.at).source, SRC);
  }
});

Deno.test("restoreCell() after a named cell and refuses text that is not one cell", () => {
  const d = deleteCell(SRC, "f");
  const out = restoreCell(d.source, d.removed, "t").source;
  equal(out.includes(`${F}table t\nfrom: a.csv\n${F}\n\n${F}fit f\n`), true);
  throws(
    () => restoreCell(d.source, "just prose\n", null),
    (e) =>
      e instanceof EditError && e.status === 400 &&
      e.message === `Cannot restore: "text" must hold exactly one closed cell`,
  );
  throws(
    () => restoreCell(d.source, d.removed, d.source.indexOf("from:") + 2),
    (e) => e instanceof EditError && /not a line start between blocks/.test(e.message),
  );
});
