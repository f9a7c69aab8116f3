/**
 * checkProgram() and parseDiagnostics(): diagnostics at the caller's lines,
 * and a checker that reads no file and runs nothing, whatever the program
 * names (code that closes its function can write `export * from "…"`
 * without the word import).
 */
import { deepEqual, equal, ok } from "node:assert/strict";
import { join } from "node:path";
import { checkProgram, parseDiagnostics } from "./check.ts";

/** A module as calc makes one: the code is the body of the default export. */
const inFunction = (code: string) =>
  `export default async function __calc(): Promise<unknown> {\n${code}\n}\n`;

const LOADS = "This code tries to load a module; code in the sandbox cannot import";

Deno.test("parseDiagnostics() takes each error at its own place and skips the notes indented under it", () => {
  const report = [
    "TS1005 [ERROR]: '}' expected.",
    "    at file:///w/$deno$stdin.mts:5:1",
    "",
    "TS1007 [ERROR]:     The parser expected to find a '}' to match the '{' token here.",
    "    export default async function f() {",
    "        at file:///w/$deno$stdin.mts:2:58",
    "",
    "TS2304 [ERROR]: Cannot find name 'q'.",
    "  q",
    "    at file:///w/$deno$stdin.mts:3:1",
  ].join("\n");
  deepEqual(parseDiagnostics(report), [
    { code: 1005, message: "'}' expected.", line: 5, column: 1 },
    { code: 2304, message: "Cannot find name 'q'.", line: 3, column: 1 },
  ]);
});

Deno.test("checkProgram() passes clean code and places a type error at the program's own line", async () => {
  const clean = await checkProgram(inFunction("const n: number = 6 * 7;\nreturn n;"));
  ok(clean.ok, clean.ok ? "" : clean.message ?? JSON.stringify(clean.diagnostics));
  const bad = await checkProgram(inFunction("const a = 1;\nconst n: number = 'six';\nreturn n;"));
  ok(!bad.ok);
  equal(bad.diagnostics.length, 1);
  // Line 3 of the program: the head, then the code's second line.
  deepEqual({ ...bad.diagnostics[0], message: "" }, {
    code: 2322,
    message: "",
    line: 3,
    column: 7,
  });
  const syntax = await checkProgram(inFunction("return {"));
  ok(!syntax.ok);
  deepEqual(syntax.diagnostics.map((d) => d.code), [1005]);
});

Deno.test("checkProgram() reads no file a program names, and says so in plain words", async () => {
  const dir = await Deno.makeTempDir({ prefix: "plumb-check-" });
  try {
    const secret = join(dir, "secret.js");
    // Not JavaScript past its first words: a checker that read it would quote it in its report.
    await Deno.writeTextFile(secret, 'const key = "TOPSECRET-4711"; not javascript here\n');
    await Deno.writeTextFile(join(dir, "data.json"), '{"password": "TOPSECRET-4711"}\n');
    const escapes = [
      `export * from "file://${secret}";`,
      `export * from "${secret}";`,
      `export { default as d } from "${join(dir, "data.json")}" with { type: "json" };`,
      `export * from "./deno.json" with { type: "json" };`,
      // A data: module that names the file in its turn.
      `export * from "data:application/javascript,export%20*%20from%20'file://${secret}'";`,
      `export * from "jsr:@std/path";`,
    ];
    for (const line of escapes) {
      const a = await checkProgram(inFunction(`return 1;\n}\n${line}\nfunction again() {`));
      ok(!a.ok, line);
      equal(a.message, LOADS, line);
      ok(!JSON.stringify(a).includes("TOPSECRET"), line);
    }
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test("checkProgram() runs nothing: neither the code nor a module it names", async () => {
  // Each would hang the checker until its time limit if it ran; a pass means nothing ran.
  const loop = "data:application/javascript,for(;;){}";
  const a = await checkProgram(
    inFunction(`return 1;\n}\nexport * from "${loop}";\nfunction again() {`),
  );
  ok(a.ok, a.ok ? "" : a.message);
  const b = await checkProgram(inFunction("return 1;\n}\nfor (;;) {}\nfunction again() {"));
  ok(b.ok, b.ok ? "" : b.message);
});

Deno.test("parseDiagnostics() reads Deno's parser error (no TypeScript number) at its place", () => {
  // The report's shape as Deno 2.9.6 prints it for `return (a +;` (measured here).
  const text =
    "error: SyntaxError: Expression expected\n  |\n2 | return (a +;\n  |            ~\n" +
    "    at file:///tmp/$deno$stdin.mts:2:12\n";
  deepEqual(parseDiagnostics(text), [
    { code: 0, message: "Expression expected", line: 2, column: 12 },
  ]);
});
