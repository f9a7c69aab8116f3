/**
 * runIsolated() against code that fights back: the child's answer cannot be
 * forged by replacing what writes it, the ways out that permissions do not
 * close are closed with plain words, and no message carries the runtime's
 * own text (a stack, the program's data: URL, a V8 phrase).
 */
import { deepEqual, equal, match, ok } from "node:assert/strict";
import { decodeColumn } from "./data.ts";
import { type IsolateAnswer, type IsolateJob, runIsolated, stopAllIsolated } from "./isolate.ts";

/** The code as the body of the default export, its line 1 on module line 2 (as calc's runModule). */
function job(code: string, more: Partial<IsolateJob> = {}): IsolateJob {
  return {
    program: "export default async function __calc(__in: any) { return await (async () => {\n" +
      `${code}\n})(); }\n`,
    input: "{}",
    gives: "value",
    memoryMb: 64,
    seconds: 5,
    ...more,
  };
}

type Stop = Extract<IsolateAnswer, { ok: false }>;

async function value(code: string, more?: Partial<IsolateJob>): Promise<unknown> {
  const a = await runIsolated(job(code, more));
  ok(a.ok, a.ok ? "" : `${a.why}: ${a.message}`);
  return a.value;
}

/** Words of the runtime that a message must not carry. */
const INTERNAL = /data:application|\bat (file|data|ext):|_child\.js|Uncaught|\n/;

async function stop(code: string, more?: Partial<IsolateJob>): Promise<Stop> {
  const a = await runIsolated(job(code, more));
  ok(!a.ok, `gave ${JSON.stringify(a.ok && a.value)}`);
  ok(!INTERNAL.test(a.message), `leaks the runtime: ${a.message}`);
  return a;
}

Deno.test("runIsolated() answers with the real value when the code replaced what writes the answer", async () => {
  const tamper = [
    '(JSON as any).stringify = () => \'{"ok":true,"value":"forged"}\';',
    "(Object.prototype as any).toJSON = () => 'forged';",
    "(Array.prototype as any).toJSON = () => 'forged';",
    "TextEncoder.prototype.encode = () => new Uint8Array(0);",
    "(Deno.stdout as any).writeSync = () => 0;",
    "Set.prototype.has = () => false;",
    "(Array as any).isArray = () => false;",
    "(Object as any).keys = () => [];",
    "String.prototype.slice = () => 'forged';",
    "Object.defineProperty(Object.prototype, 'why', { set() {}, get() { return 'time'; } });",
  ].join("\n");
  deepEqual(await value(`${tamper}\nreturn { a: [1, 'two', null], b: { c: true } };`), {
    a: [1, "two", null],
    b: { c: true },
  });
  // Refusals keep their words too.
  const a = await stop(`${tamper}\nconst x: any = { y: {} };\nx.y.x = x;\nreturn x;`);
  equal(a.why, "not-data");
  equal(a.message, "returned a value that is not data: a value that contains itself at value.y.x");
});

Deno.test("runIsolated() gives a table's columns whole when the code replaced typed arrays' accessors", async () => {
  const a = await runIsolated(job(
    "const proto = Object.getPrototypeOf(Uint8Array.prototype);\n" +
      "Object.defineProperty(proto, 'length', { get() { return 0; } });\n" +
      "Object.defineProperty(proto, 'buffer', { get() { return new ArrayBuffer(8); } });\n" +
      "return { columns: { x: [1, 2, 3], y: new Float64Array([0.5, NaN, -2]) }, units: { y: 'mV' } };",
    { gives: "table" },
  ));
  ok(a.ok, a.ok ? "" : a.message);
  const t = a.value as { columns: Record<string, unknown>; units: unknown; names: string[] };
  deepEqual(t.names, ["x", "y"]);
  deepEqual([...decodeColumn(t.columns.x)!], [1, 2, 3]);
  deepEqual([...decodeColumn(t.columns.y)!], [0.5, NaN, -2]);
  deepEqual(t.units, { y: "mV" });
});

Deno.test("runIsolated() refuses the key __proto__ anywhere in a value, and takes constructor as data", async () => {
  const a = await stop('return JSON.parse(\'[{"\\\\u005f_proto__": {"x": 1}}]\');');
  equal(a.why, "not-data");
  match(a.message, /^returned a value that is not data: the key "__proto__" .* at value\[0\]$/);
  const t = await stop(
    "return { columns: JSON.parse('{\"__proto__\": [1, 2]}') };",
    { gives: "table" },
  );
  match(t.message, /column "__proto__"/);
  deepEqual(await value("return { constructor: 1, prototype: 'A1', toString: 'x' };"), {
    constructor: 1,
    prototype: "A1",
    toString: "x",
  });
});

Deno.test("runIsolated() names what is not data, with its path", async () => {
  const cases: [string, RegExp][] = [
    ["return undefined;", /: undefined at value$/],
    ["return { n: 10n };", /: a bigint at value\.n$/],
    ["return [Symbol('s')];", /: a symbol at value\[0\]$/],
    ["return { v: new DataView(new ArrayBuffer(8)) };", /: a DataView .* at value\.v$/],
    ["return { m: new Map() };", /: a Map .* at value\.m$/],
    ["return { i: [Infinity] };", /: Infinity .* at value\.i\[0\]$/],
    ["return new Float64Array([1, NaN]);", /: NaN \(not finite\) at value\[1\]$/],
    ["let v: any = 1;\nfor (let i = 0; i < 70; i++) v = [v];\nreturn v;", /deeper than 64 levels/],
  ];
  for (const [code, says] of cases) {
    const a = await stop(code);
    equal(a.why, "not-data", a.message);
    match(a.message, says);
  }
  // A typed array is data: its numbers. A getter is read once, as its value.
  deepEqual(await value("return { t: new Int32Array([1, -2]), get g() { return 7; } };"), {
    t: [1, -2],
    g: 7,
  });
});

Deno.test("runIsolated() closes the runtime's internals, node built-ins, workers and web storage in plain words", async () => {
  const noCore = await stop(
    "return (Deno as any)[(Deno as any).internal].core.evalContext('6*7', 'x:y');",
  );
  equal(noCore.message, "TypeError: Cannot read properties of undefined (reading 'core')");
  // Deno KV is unstable, so not there without its flag.
  const kv = await stop("return await (Deno as any).openKv();");
  deepEqual([kv.why, kv.message], ["threw", "TypeError: Deno.openKv is not a function"]);
  const imports = "tried to load a module; calc cells cannot import";
  for (
    const code of [
      "return (globalThis as any).process.getBuiltinModule('node:vm').runInThisContext('6*7');",
      "return (globalThis as any).process.getBuiltinModule('worker_threads');",
      "return Object.keys((globalThis as any).process.binding('fs'));",
      "return await import('https://example.com/x.ts');",
      "return await import('npm:left-pad');",
    ]
  ) {
    const a = await stop(code);
    deepEqual([a.why, a.message], ["denied", imports], code);
  }
  const w = await stop(
    "\nnew Worker('data:application/javascript,1', { type: 'module' });\nreturn 1;",
  );
  deepEqual([w.why, w.message], [
    "denied",
    "tried to start a worker; calc cells run on one thread",
  ]);
  equal(w.line, 3, "the line of the module that tried (code line 2)");
  const b = await stop("new BroadcastChannel('x');\nreturn 1;");
  equal(b.message, "tried to start a worker; calc cells run on one thread");
  for (const name of ["localStorage", "sessionStorage", "caches"]) {
    const s = await stop(`return typeof (globalThis as any).${name}.keys;`);
    equal(s.message, "tried to keep data between runs; each run of a calc cell starts afresh");
  }
});

Deno.test("runIsolated() keeps the process from ending by any exit, and answers for errors thrown outside the run", async () => {
  for (
    const code of [
      "Deno.exit(0);",
      "(globalThis as any).process.exit(0);",
      "(globalThis as any).process.reallyExit(0);",
      "(globalThis as any).process.abort();",
    ]
  ) {
    const a = await stop(`${code}\nreturn 1;`);
    deepEqual(
      [a.why, a.message],
      ["exit", "tried to end its process; calc cells return a value instead"],
      code,
    );
  }
  const late = await stop(
    "setTimeout(() => { throw new RangeError('late'); }, 0);\nreturn await new Promise(() => {});",
  );
  deepEqual([late.why, late.message], ["threw", "RangeError: late"]);
  const rejected = await stop(
    "Promise.reject(new Error('nobody waits'));\nreturn await new Promise(() => {});",
  );
  deepEqual([rejected.why, rejected.message], ["threw", "nobody waits"]);
});

Deno.test("runIsolated() reads only its answer line: what the code writes after it is ignored", async () => {
  deepEqual(
    await value(
      "addEventListener('unload', () => Deno.stdout.writeSync(new TextEncoder().encode('junk\\n{')));\n" +
        "return 5;",
    ),
    5,
  );
  const closed = await stop("Deno.stdout.close();\nreturn 1;");
  deepEqual([closed.why, closed.message], ["no-answer", "ended without a value (exit code 3)"]);
});

Deno.test("runIsolated() says what went over a limit in plain words", async () => {
  const heap = await stop("const a: number[][] = [];\nfor (;;) a.push(new Array(1e5).fill(1.5));");
  deepEqual([heap.why, heap.message], ["memory", "used more than 64 MB"]);
  const buffers = await stop("const a = [];\nfor (;;) a.push(new Uint8Array(2 ** 24).fill(1));");
  deepEqual([buffers.why, buffers.message], ["memory", "used more than 64 MB"]);
  const wasm = await stop(
    "const m = new WebAssembly.Memory({ initial: 1, maximum: 65536 });\n" +
      "for (let i = 1; ; i++) { m.grow(1); new Uint8Array(m.buffer).fill(1, (i - 1) * 65536); }",
  );
  equal(wasm.message, "used more than 64 MB");
  const huge = await stop("return new ArrayBuffer(2 ** 40).byteLength;");
  deepEqual([huge.why, huge.message], [
    "memory",
    "asked for more memory at once than it may use; its limit is 64 MB",
  ]);
  const text = await stop("return 'x'.repeat(2 ** 30);");
  deepEqual([text.why, text.message], [
    "too-large",
    "tried to make text longer than a string can hold (about 512 MB)",
  ]);
  const big = await stop("return 'x'.repeat(40e6);", { memoryMb: 512 });
  deepEqual([big.why, big.message], ["too-large", "returned more than 32 MB of data"]);
  const flood = await stop(
    "const b = new TextEncoder().encode('y'.repeat(1 << 20));\nfor (;;) Deno.stdout.writeSync(b);",
  );
  deepEqual([flood.why, flood.message], ["too-large", "wrote more than 64 MB of output"]);
  const pending = await stop("return await new Promise(() => {});", { seconds: 1 });
  match(pending.message, /^(stopped after 1 s|ended without a value: its promise never settled)$/);
});

Deno.test("runIsolated() gives a thrown error's words on one line, without the program's URL", async () => {
  const long = await stop("throw new Error('y'.repeat(5000));");
  equal(long.why, "threw");
  equal(long.message.length, 2001, "cut to 2000 characters and an ellipsis");
  const lines = await stop("throw new TypeError('first\\nsecond');");
  equal(lines.message, "TypeError: first");
  const getter = await stop("throw { get message() { throw new Error('no'); } };");
  equal(getter.why, "threw");
  const plain = await stop("throw 'just text';");
  equal(plain.message, "just text");
  // A module the runtime cannot read (the checker would have said so first): located, no URL.
  const a = await runIsolated({ ...job("return 1;"), program: "export default 1 +;\n" });
  ok(!a.ok && a.why === "threw" && !INTERNAL.test(a.message), a.ok ? "" : a.message);
});

Deno.test("runIsolated() keeps the console, an error's stack without the program's URL or the sandbox's path", async () => {
  const a = await runIsolated(
    job("console.log(new Error('shown'));\nconsole.info('n', 1, [2]);\nreturn 1;"),
  );
  ok(a.ok);
  match(a.console, /^Error: shown\n {4}at code:2:\d+\n/);
  match(a.console, /\nn 1 \[ 2 \]\n$/);
  ok(!/data:|file:|_child/.test(a.console), a.console);
});

Deno.test("runIsolated() starts each run clean: prototypes spoiled by one run are whole in the next", async () => {
  deepEqual(
    await value(
      "(Object.prototype as any).polluted = 1;\n(Array.prototype as any).map = null;\nreturn [1];",
    ),
    [1],
  );
  deepEqual(await value("return [({} as any).polluted ?? null, typeof [].map];"), [
    null,
    "function",
  ]);
  equal(({} as Record<string, unknown>).polluted, undefined);
});

Deno.test("stopAllIsolated() ends the spare processes (last: the suite leaves none behind)", () => {
  stopAllIsolated();
});
