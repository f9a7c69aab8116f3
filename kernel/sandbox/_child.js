// The disposable child process that runs one piece of user code (kernel/sandbox/isolate.ts).
//
// Started as `deno run` with no --allow flags, an empty environment, a V8
// heap cap and code generation from strings disabled; it waits on standard
// input for one job, runs it, writes one answer line and ends. Plain
// JavaScript, so the child transpiles nothing of its own.
//
//   stdin: {"nonce", "program", "input", "gives", "consoleLimit", "resultLimit"}   (then EOF)
//   stdout: <nonce>{"ok": true, "value", "console", "consoleCut"}            one line
//        or <nonce>{"ok": false, "why", "message", "line", "column", "console", "consoleCut"}
//
// The program is a TypeScript module (a data: URL, transpiled by the
// runtime) whose default export takes the input. Typed arrays cross as
// {"\u0000f64": base64} in both directions. Before it is imported, the
// ways out that permissions do not close are closed here: workers (and
// node:worker_threads), web storage (it would outlive the run), the
// runtime's internals (`Deno[Deno.internal]` can build code from text),
// node built-ins reached without `import` (`process.getBuiltinModule`),
// and ending the process.
//
// The user's code may replace any global or prototype method (JSON.stringify,
// Object.prototype.toJSON, TextEncoder.prototype.encode, Deno.stdout.writeSync…).
// So everything used after it runs is taken here first and called through
// Reflect.apply, and the answer's JSON text is written by this file itself:
// what the child says is what it found, and the parent checks it again.
// Error messages are still read with regular expressions, which the code
// could spoil by replacing RegExp.prototype.exec: only its own message suffers.

const F64 = "\u0000f64";
const MEMORY_MARK = "plumb-sandbox: memory cap passed";

// ── Taken before any user code runs ─────────────────────────────────────────
const apply = Reflect.apply;
const getPrototypeOf = Reflect.getPrototypeOf;
const ObjectPrototype = Object.prototype;
const keysOf = Object.keys;
const isArray = Array.isArray;
const stringify = JSON.stringify;
const isFinite = Number.isFinite;
const toNumber = Number;
const U8 = Uint8Array;
const U16 = Uint16Array;
const F64A = Float64Array;
const AB = ArrayBuffer;
const TypedArrayPrototype = getPrototypeOf(U8.prototype);
const typedLength = Object.getOwnPropertyDescriptor(TypedArrayPrototype, "length").get;
const typedBuffer = Object.getOwnPropertyDescriptor(TypedArrayPrototype, "buffer").get;
const SetC = Set;
const setHas = Set.prototype.has;
const setAdd = Set.prototype.add;
const setDelete = Set.prototype.delete;
const exec = RegExp.prototype.exec;
const indexOf = String.prototype.indexOf;
const sliceText = String.prototype.slice;
const toB64 = btoa;
const decode = TextDecoder.prototype.decode;
const utf16 = new TextDecoder("utf-16le");
const encode = TextEncoder.prototype.encode;
const encoder = new TextEncoder();
const stdout = Deno.stdout;
const writeSync = stdout.writeSync;
const inspect = Deno.inspect;
const realExit = Deno.exit;
const ErrorC = Error;
const internal = Deno.internal;

const match = (re, s) => apply(exec, re, [s]);
const has = (set, v) => apply(setHas, set, [v]);

/** A refusal of ours: the brand cannot be forged by user code. */
class Refused {
  #brand = true;
  // Fields, not assignments: a setter the code put on Object.prototype is never called.
  why;
  message;
  /** Where the code met the refusal (a stub's own stack), or "". */
  stack;
  constructor(why, message, stack = "") {
    this.why = why;
    this.message = message;
    this.stack = stack;
  }
  static is(x) {
    return x !== null && typeof x === "object" && #brand in x;
  }
}

function fromBase64(s) {
  const bin = atob(s);
  const bytes = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) bytes[i] = bin.charCodeAt(i);
  return new Float64Array(bytes.buffer);
}

/** Base64 of a Float64Array of ours, through taken functions only (3 × 4096 bytes a piece). */
function toBase64(a) {
  const bytes = new U8(apply(typedBuffer, a, []));
  const n = apply(typedLength, bytes, []);
  const piece = 3 * 4096;
  const wide = new AB(piece * 2);
  let out = "";
  for (let at = 0; at < n; at += piece) {
    const len = n - at < piece ? n - at : piece;
    const w = new U16(wide, 0, len);
    for (let i = 0; i < len; i++) w[i] = bytes[at + i];
    out += toB64(apply(decode, utf16, [w]));
  }
  return out;
}

function revive(_key, v) {
  if (v !== null && typeof v === "object" && !Array.isArray(v) && typeof v[F64] === "string") {
    const keys = Object.keys(v);
    if (keys.length === 1) return fromBase64(v[F64]);
  }
  return v;
}

/** Where a value is not data: a path such as `value.fits[2]`. */
function notData(path, what) {
  return new Refused("not-data", `returned a value that is not data: ${what} at ${path}`);
}

const tooLarge = () => new Refused("too-large", "too-large");

/** The length of a typed array (not a DataView), or -1 for anything else. */
function typedLengthOf(v) {
  try {
    return apply(typedLength, v, []);
  } catch {
    return -1;
  }
}

/** A class instance's name for a message, read without trusting it. */
function className(v) {
  try {
    const name = v.constructor.name;
    if (typeof name === "string" && name !== "") return `a ${apply(sliceText, name, [0, 60])}`;
  } catch { /* no name */ }
  return "an object of a class";
}

/**
 * The value as JSON text: typed arrays as arrays of numbers, refusing
 * functions, symbols, class instances, cycles, non-finite numbers, the key
 * `__proto__` (a receiver that assigns it sets a prototype) and more than
 * `budget.left` characters.
 */
function dataText(v, path, seen, budget, depth) {
  if (depth > 64) throw notData(path, "nesting deeper than 64 levels");
  if (v === null) return "null";
  const t = typeof v;
  if (t === "boolean") return v ? "true" : "false";
  if (t === "string") {
    budget.left -= v.length + 2;
    if (budget.left < 0) throw tooLarge();
    return stringify(v);
  }
  if (t === "number") {
    budget.left -= 24;
    if (!isFinite(v)) {
      throw notData(path, `${v} (a number that is not finite; return null for "none")`);
    }
    return stringify(v);
  }
  if (t === "undefined") throw notData(path, "undefined");
  if (t === "function") throw notData(path, "a function");
  if (t === "symbol" || t === "bigint") throw notData(path, `a ${t}`);
  if (has(seen, v)) throw notData(path, "a value that contains itself");
  const n = typedLengthOf(v);
  if (n >= 0) {
    budget.left -= n * 24;
    if (budget.left < 0) throw tooLarge();
    let out = "[";
    for (let i = 0; i < n; i++) {
      const x = toNumber(v[i]);
      if (!isFinite(x)) throw notData(`${path}[${i}]`, `${x} (not finite)`);
      out += (i === 0 ? "" : ",") + stringify(x);
    }
    return out + "]";
  }
  apply(setAdd, seen, [v]);
  let out;
  if (isArray(v)) {
    const len = v.length;
    const count = typeof len === "number" ? len : 0;
    out = "[";
    for (let i = 0; i < count; i++) {
      budget.left -= 1;
      if (budget.left < 0) throw tooLarge();
      out += (i === 0 ? "" : ",") + dataText(v[i], `${path}[${i}]`, seen, budget, depth + 1);
    }
    out += "]";
  } else {
    const proto = getPrototypeOf(v);
    if (proto !== ObjectPrototype && proto !== null) {
      throw notData(
        path,
        `${className(v)} (only plain objects, arrays, numbers, text, true/false and null)`,
      );
    }
    const keys = keysOf(v);
    out = "{";
    for (let i = 0; i < keys.length; i++) {
      const k = keys[i];
      if (k === "__proto__") {
        throw notData(`${path}`, 'the key "__proto__" (a name objects keep for their prototype)');
      }
      budget.left -= k.length + 4;
      if (budget.left < 0) throw tooLarge();
      out += (i === 0 ? "" : ",") + stringify(k) + ":" +
        dataText(v[k], `${path}.${k}`, seen, budget, depth + 1);
    }
    out += "}";
  }
  apply(setDelete, seen, [v]);
  return out;
}

const refuseTable = (message) => new Refused("not-data", message);

/** One column as a Float64Array: a list of numbers, null or undefined for missing. */
function columnOf(name, c) {
  const typed = typedLengthOf(c);
  if (typed < 0 && !isArray(c)) {
    throw refuseTable(`returned a table whose column "${name}" is not a list of numbers`);
  }
  const len = typed >= 0 ? typed : c.length;
  const n = typeof len === "number" && len >= 0 ? len : 0;
  const a = new F64A(n);
  for (let i = 0; i < n; i++) {
    const x = c[i];
    if (x === null || x === undefined) a[i] = NaN;
    else if (typeof x === "number" || typeof x === "bigint") a[i] = toNumber(x);
    else {
      throw refuseTable(
        `returned a table whose column "${name}" holds a ${typeof x} in row ${i + 1}`,
      );
    }
  }
  return a;
}

/** A returned table as JSON text: named columns of equal length (as F64) and their units. */
function tableText(v, budget) {
  if (v === null || typeof v !== "object" || isArray(v)) {
    throw refuseTable(
      "returned a value that is not a table: give { columns: { name: numbers, … }, units? }",
    );
  }
  const cols = v.columns;
  if (cols === null || typeof cols !== "object" || isArray(cols)) {
    throw refuseTable("returned a table without columns: give { columns: { name: numbers, … } }");
  }
  const names = keysOf(cols);
  if (names.length === 0) throw refuseTable("returned a table with no columns");
  const isName = { __proto__: null };
  let columns = "", list = "";
  let rows = -1;
  for (let i = 0; i < names.length; i++) {
    const name = names[i];
    if (name === "__proto__") {
      throw refuseTable('returned a table with a column "__proto__": give it another name');
    }
    const a = columnOf(name, cols[name]);
    const n = apply(typedLength, a, []);
    if (rows >= 0 && n !== rows) {
      throw refuseTable(
        `returned a table whose columns differ in length: "${
          names[0]
        }" has ${rows} rows, "${name}" has ${n}`,
      );
    }
    rows = n;
    budget.left -= n * 12 + name.length;
    if (budget.left < 0) throw tooLarge();
    isName[name] = true;
    const sep = i === 0 ? "" : ",";
    columns += `${sep}${stringify(name)}:{${stringify(F64)}:${stringify(toBase64(a))}}`;
    list += sep + stringify(name);
  }
  let units = "";
  const u = v.units;
  if (u !== undefined && u !== null) {
    if (typeof u !== "object" || isArray(u)) {
      throw refuseTable("returned table units that are not { column: unit }");
    }
    const keys = keysOf(u);
    for (let i = 0; i < keys.length; i++) {
      const k = keys[i];
      if (isName[k] !== true) {
        throw refuseTable(`returned a unit for "${k}", which is not one of the table's columns`);
      }
      const unit = u[k];
      if (typeof unit !== "string") {
        throw refuseTable(`returned a unit for "${k}" that is not text`);
      }
      budget.left -= unit.length + k.length;
      if (budget.left < 0) throw tooLarge();
      units += `${i === 0 ? "" : ","}${stringify(k)}:${stringify(unit)}`;
    }
  }
  return `{"columns":{${columns}},"units":{${units}},"names":[${list}]}`;
}

const DENIED = {
  __proto__: null,
  read: "tried to read a file; calc cells cannot touch the disk",
  write: "tried to write a file; calc cells cannot touch the disk",
  net: "tried to reach the network; calc cells have no network",
  import: "tried to load a module; calc cells cannot import",
  env: "tried to read an environment variable; calc cells see no environment",
  sys: "tried to read facts about the machine; calc cells cannot",
  run: "tried to start a process; calc cells cannot",
  ffi: "tried to load a native library; calc cells cannot",
  worker: "tried to start a worker; calc cells run on one thread",
  storage: "tried to keep data between runs; each run of a calc cell starts afresh",
  code: "tried to build code from text (eval or Function); calc cells cannot",
};

/** The longest message a failure carries (characters). */
const MESSAGE_LIMIT = 2000;

/** A field of a thrown value as text, read without trusting it ("" when not text). */
function textField(err, key) {
  try {
    const v = err[key];
    return typeof v === "string" ? v : "";
  } catch {
    return "";
  }
}

/** A message without the program's data: URL, on its first line, cut to the limit. */
function plain(text) {
  let out = text;
  for (;;) {
    const at = apply(indexOf, out, ["data:application/typescript"]);
    if (at < 0) break;
    let end = at;
    while (end < out.length && out[end] !== " " && out[end] !== "\n" && out[end] !== ")") end++;
    out = apply(sliceText, out, [0, at]) + "the cell's code" + apply(sliceText, out, [end]);
  }
  const nl = apply(indexOf, out, ["\n"]);
  if (nl >= 0) out = apply(sliceText, out, [0, nl]);
  return out.length > MESSAGE_LIMIT ? apply(sliceText, out, [0, MESSAGE_LIMIT]) + "…" : out;
}

/** What a thrown value says: its kind and words, for classification. */
function describe(err) {
  if (err === null || (typeof err !== "object" && typeof err !== "function")) {
    let s;
    try {
      s = typeof err === "symbol" ? "a symbol" : "" + err;
    } catch {
      s = "a value";
    }
    return { name: "", message: s, stack: "" };
  }
  const name = textField(err, "name");
  const message = textField(err, "message");
  if (name === "" && message === "") {
    let shown = "a value that is not an Error";
    try {
      shown = inspect(err, { depth: 2, colors: false });
    } catch { /* keep the plain words */ }
    return { name: "", message: shown, stack: "" };
  }
  return { name, message, stack: textField(err, "stack") };
}

/** How a thrown value reads as a failure: why, in plain words (an object: no iterator). */
function classify(name, message) {
  const perm = match(/Requires (\w+) access/, message);
  if (name === "NotCapable" || perm) {
    const key = perm ? perm[1] : "";
    return { why: "denied", said: DENIED[key] ?? `was refused: ${plain(message)}` };
  }
  if (match(/Failed to spawn/, message)) return { why: "denied", said: DENIED.run };
  if (name === "EvalError" || match(/Code generation from strings/, message)) {
    return { why: "denied", said: DENIED.code };
  }
  if (match(/remote specifier|--no-remote|npm specifiers|--no-npm|jsr:/, message)) {
    return { why: "denied", said: DENIED.import };
  }
  if (match(/Invalid string length/, message)) {
    return {
      why: "too-large",
      said: "tried to make text longer than a string can hold (about 512 MB)",
    };
  }
  if (match(/Array buffer allocation failed|Invalid typed array length/, message)) {
    return { why: "memory", said: "asked for more memory at once than it may use" };
  }
  // A module the runtime could not read comes as a TypeError whose words start "SyntaxError:".
  const label = match(/^SyntaxError: /, message) ? "" : name && name !== "Error" ? name + ": " : "";
  return { why: "threw", said: `${label}${plain(message)}` };
}

/** The answer for an error thrown by user code, with its line in the program when known. */
function failure(err) {
  let why, said, stack;
  if (Refused.is(err)) {
    why = err.why;
    said = err.message;
    stack = err.stack;
  } else {
    const d = describe(err);
    ({ why, said } = classify(d.name, d.message));
    stack = d.stack;
  }
  const at = match(/data:application\/typescript[^\s)]*?:(\d+):(\d+)\)?/, stack);
  return {
    ok: false,
    why,
    message: said,
    line: at ? toNumber(at[1]) : null,
    column: at ? toNumber(at[2]) : null,
  };
}

/** A stand-in that refuses when called or constructed, at the caller's line. */
const refuse = (why, message) =>
  function refused() {
    throw new Refused(why, message, textField(new ErrorC(), "stack"));
  };

function closeWaysOut() {
  const fix = (target, key, descriptor) => {
    try {
      Object.defineProperty(target, key, { configurable: false, ...descriptor });
    } catch { /* frozen already: it stays, still without permissions */ }
  };
  const stop = refuse("exit", "tried to end its process; calc cells return a value instead");
  const noWorker = refuse("denied", DENIED.worker);
  const noStorage = refuse("denied", DENIED.storage);
  const noImport = refuse("denied", DENIED.import);
  fix(globalThis, "Worker", { value: noWorker, writable: false });
  fix(globalThis, "BroadcastChannel", { value: noWorker, writable: false });
  for (const name of ["localStorage", "sessionStorage", "caches"]) {
    fix(globalThis, name, { get: noStorage });
  }
  try {
    delete Deno[internal]; // core.evalContext builds code from text; the runtime's own code keeps its references
  } catch { /* not deletable */ }
  fix(Deno, "exit", { value: stop, writable: false });
  const proc = globalThis.process;
  if (proc) {
    for (const name of ["exit", "reallyExit", "abort"]) fix(proc, name, { value: stop });
    // node built-ins without `import`: worker_threads and vm (code from text) among them
    for (const name of ["getBuiltinModule", "binding", "_linkedBinding"]) {
      fix(proc, name, { value: noImport });
    }
  }
}

function captureConsole(limit) {
  const kept = { text: "", cut: 0 };
  const write = (...args) => {
    let line = "";
    try {
      line = args.map((a) => typeof a === "string" ? a : Deno.inspect(a, { depth: 4 })).join(" ");
    } catch {
      line = "(a value that could not be shown)";
    }
    if (typeof line !== "string") line = "(a value that could not be shown)";
    // A printed error's stack names the program by its data: URL and this file by its path.
    line = line.replace(/data:application\/typescript;base64,[A-Za-z0-9+/=.]+/g, "code")
      .replace(/file:\/\/\S*?_child\.js/g, "sandbox");
    if (kept.text.length + line.length + 1 > limit) kept.cut++;
    else kept.text += line + "\n";
  };
  for (const m of ["log", "info", "warn", "error", "debug", "trace", "table", "dir"]) {
    try {
      console[m] = write;
    } catch { /* keep the original */ }
  }
  return kept;
}

let answered = false;

/** Writes the one answer line (`body` is its JSON text without the console) and ends. */
function finish(nonce, body, kept) {
  if (answered) return;
  answered = true;
  const text = `${nonce}{${body},"console":${stringify(kept.text)},"consoleCut":${
    stringify(kept.cut)
  }}\n`;
  try {
    const bytes = apply(encode, encoder, [text]);
    const buffer = apply(typedBuffer, bytes, []);
    const n = apply(typedLength, bytes, []);
    for (let i = 0; i < n;) i += apply(writeSync, stdout, [new U8(buffer, i, n - i)]);
  } catch {
    realExit(3); // the code closed standard output: the parent gets no answer
  }
  realExit(0);
}

/** The JSON text (without braces) of a failure. */
function failureBody(f) {
  return `"ok":false,"why":${stringify(f.why)},"message":${stringify(f.message)},"line":${
    f.line === null ? "null" : stringify(f.line)
  },"column":${f.column === null ? "null" : stringify(f.column)}`;
}

/**
 * The memory watch: a thread of its own reads the process's resident size
 * every 20 ms (array buffers and threads live outside the V8 heap, and the
 * parent may not read /proc) and, past the cap given as the first argument,
 * says so on standard error, where the parent stops the process.
 */
function watchMemory(capMb) {
  const src = `const cap = ${Number(capMb) * 1048576};
    setInterval(() => {
      if (Deno.memoryUsage().rss > cap) {
        Deno.stderr.writeSync(new TextEncoder().encode("\\n${MEMORY_MARK}\\n"));
      }
    }, 20);`;
  new Worker("data:application/javascript," + encodeURIComponent(src), { type: "module" });
}

watchMemory(Deno.args[0] ?? 352);
// Closed before the job is read: the parent waits for the answer, not for this.
closeWaysOut();
const raw = await new Response(Deno.stdin.readable).text();
if (raw.length === 0) realExit(0); // the parent ended before handing a job over
const job = JSON.parse(raw, revive);
const nonce = job.nonce;
const resultLimit = job.resultLimit;
const gives = job.gives;
const kept = captureConsole(job.consoleLimit);
// An error thrown outside the awaited chain (a timer's callback, a promise no one awaits)
// answers for the run instead of ending the process without a word.
const uncaught = (e) => {
  e.preventDefault();
  finish(nonce, failureBody(failure(e.type === "error" ? e.error : e.reason)), kept);
};
addEventListener("error", uncaught);
addEventListener("unhandledrejection", uncaught);
let body;
try {
  let bin = "";
  const bytes = encoder.encode(job.program);
  for (let i = 0; i < bytes.length; i += 8192) {
    bin += String.fromCharCode.apply(null, bytes.subarray(i, i + 8192));
  }
  const mod = await import("data:application/typescript;base64," + btoa(bin));
  const value = await mod.default(job.input);
  const budget = { left: resultLimit };
  const data = gives === "table"
    ? tableText(value, budget)
    : dataText(value, "value", new SetC(), budget, 0);
  body = `"ok":true,"value":${data}`;
} catch (err) {
  let f;
  try {
    f = failure(err);
  } catch {
    f = {
      ok: false,
      why: "threw",
      message: "a value that could not be shown",
      line: null,
      column: null,
    };
  }
  body = failureBody(f);
}
finish(nonce, body, kept);
