/**
 * Bad input to a joint cell gets a located error in plain words (class,
 * message and option path asserted).
 */
import { deepEqual, equal, ok, throws } from "node:assert/strict";
import { CellError } from "../../kernel/errors.ts";
import { decayTables, makeTable, runJointCell } from "./_fixtures_test.ts";

const TABLES = decayTables();
const NAMES = Object.keys(TABLES);
const MODEL = "y = a*exp(-k*t) + b";

function refused(options: Record<string, unknown>, inputs = TABLES): CellError {
  let caught: unknown;
  try {
    runJointCell(options, inputs);
  } catch (e) {
    caught = e;
  }
  ok(caught instanceof CellError, String(caught));
  return caught;
}

Deno.test("joint: a table lacking a column the model names is refused at that table, with the near miss", () => {
  const inputs = { ...TABLES, "at-40": makeTable({ time: [0, 1, 2, 3], y: [9, 7, 5, 4] }) };
  const e = refused({ tables: NAMES, model: MODEL, shared: ["k"] }, inputs);
  ok(
    e.message.startsWith(
      `Cannot fit "decay": table "at-40" has no column "t" (a column the model names): did you mean`,
    ),
    e.message,
  );
  deepEqual(e.path, ["tables", 2]);
});

Deno.test("joint: a shared parameter that is not in the model is refused with a suggestion", () => {
  const e = refused({ tables: NAMES, model: MODEL, shared: ["kk"] });
  equal(
    e.message,
    `Shared parameter "kk" of joint "decay" is not a parameter of the model: did you mean "k"?`,
  );
  deepEqual(e.path, ["shared", 0]);
});

Deno.test("joint: fewer rows than parameters, and a group with fewer rows than its own parameters", () => {
  const tiny = {
    p: makeTable({ t: [0, 1], y: [5, 3] }),
    q: makeTable({ t: [0, 1], y: [6, 4] }),
  };
  const e = refused({ tables: ["p", "q"], model: MODEL, start: { a: 5, k: 0.5, b: 0 } }, tiny);
  equal(
    e.message,
    `Cannot fit "decay": 4 rows for 6 parameters (0 shared, 3 per group × 2 groups): a joint fit needs more rows than parameters`,
  );
  const short = { ...TABLES, "at-40": makeTable({ t: [0], y: [9] }) };
  const f = refused(
    { tables: NAMES, model: MODEL, shared: ["k"], start: { a: 50, k: 0.2, b: 4 } },
    short,
  );
  ok(
    f.message.startsWith(
      `Cannot fit "decay": table "at-40" has 2 rows for its 2 own parameters`,
    ) === false,
  );
  equal(f.path[0], "tables");
});

Deno.test("joint: a table with no usable rows is refused, naming the table", () => {
  const empty = { ...TABLES, "at-40": makeTable({ t: [NaN, NaN], y: [1, 2] }) };
  const e = refused({ tables: NAMES, model: MODEL, shared: ["k"] }, empty);
  equal(
    e.message,
    `Cannot fit "decay": table "at-40" has no rows with every column the model uses (2 rows left out for missing values)`,
  );
  deepEqual(e.path, ["tables", 2]);
});

Deno.test("joint: option errors at parse (one table, both forms, by without on, a per-group start of a shared parameter)", () => {
  throws(
    () => runJointCell({ tables: ["at-20"], model: MODEL }, TABLES),
    /lists 1 table: a joint fit needs two or more/,
  );
  throws(
    () => runJointCell({ tables: NAMES, on: "x", by: "g", model: MODEL }, TABLES),
    /names both "tables" and "on"/,
  );
  throws(() => runJointCell({ by: "g", model: MODEL }, TABLES), /Missing "on" in joint "decay"/);
  throws(
    () =>
      runJointCell(
        { tables: NAMES, model: MODEL, shared: ["k"], start: { k: { "at-20": 1 } } },
        TABLES,
      ),
    /"k" is shared, so it takes one number, not one per group/,
  );
  throws(
    () => runJointCell({ tables: NAMES, model: MODEL, start: { a: { "at-2O": 1 } } }, TABLES),
    /names group "at-2O", which is not one of the groups: did you mean "at-20"\?/,
  );
});
