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
// ways out that permissions do not close are closed here: module loading of
// local files (refused before the run by the word check, and no code from
// strings), workers, web storage, and ending the process.

const F64 = "\u0000f64";
const MEMORY_MARK = "plumb-sandbox: memory cap passed";
const stdout = Deno.stdout;
const encoder = new TextEncoder();
const realExit = Deno.exit;

function fromBase64(s) {
  const bin = atob(s);
  const bytes = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) bytes[i] = bin.charCodeAt(i);
  return new Float64Array(bytes.buffer);
}

function toBase64(a) {
  const bytes = new Uint8Array(a.buffer, a.byteOffset, a.byteLength);
  let bin = "";
  for (let i = 0; i < bytes.length; i += 8192) {
    bin += String.fromCharCode.apply(null, bytes.subarray(i, i + 8192));
  }
  return btoa(bin);
}

function revive(_key, v) {
  if (v !== null && typeof v === "object" && !Array.isArray(v) && typeof v[F64] === "string") {
    const keys = Object.keys(v);
    if (keys.length === 1) return fromBase64(v[F64]);
  }
  return v;
}

class Refused extends Error {}

/** Where a value is not data: a path such as `value.fits[2]`. */
function notData(path, what) {
  return new Refused(`returned a value that is not data: ${what} at ${path}`);
}

/**
 * The value as plain JSON-ready data (typed arrays as arrays, or as F64 for
 * table columns), refusing functions, symbols, class instances, cycles,
 * non-finite numbers and more than `limit` characters of text.
 */
function toData(v, path, seen, budget, depth) {
  if (depth > 64) throw notData(path, "nesting deeper than 64 levels");
  if (v === null || typeof v === "boolean") return v;
  if (typeof v === "string") {
    budget.left -= v.length + 2;
    if (budget.left < 0) throw new Refused("too-large");
    return v;
  }
  if (typeof v === "number") {
    budget.left -= 24;
    if (!Number.isFinite(v)) {
      throw notData(path, `${v} (a number that is not finite; return null for "none")`);
    }
    return v;
  }
  if (typeof v === "undefined") throw notData(path, "undefined");
  if (typeof v === "function") throw notData(path, "a function");
  if (typeof v === "symbol" || typeof v === "bigint") throw notData(path, `a ${typeof v}`);
  if (seen.has(v)) throw notData(path, "a value that contains itself");
  if (ArrayBuffer.isView(v) && !(v instanceof DataView)) {
    budget.left -= v.length * 24;
    if (budget.left < 0) throw new Refused("too-large");
    const out = [];
    for (let i = 0; i < v.length; i++) {
      const x = Number(v[i]);
      if (!Number.isFinite(x)) throw notData(`${path}[${i}]`, `${x} (not finite)`);
      out.push(x);
    }
    return out;
  }
  seen.add(v);
  let out;
  if (Array.isArray(v)) {
    out = [];
    for (let i = 0; i < v.length; i++) {
      out.push(toData(v[i], `${path}[${i}]`, seen, budget, depth + 1));
    }
  } else {
    const proto = Object.getPrototypeOf(v);
    if (proto !== Object.prototype && proto !== null) {
      const name = v?.constructor?.name ?? "an object of a class";
      throw notData(
        path,
        `a ${name} (only plain objects, arrays, numbers, text, true/false and null)`,
      );
    }
    out = {};
    for (const k of Object.keys(v)) {
      budget.left -= k.length + 4;
      const d = toData(v[k], `${path}.${k}`, seen, budget, depth + 1);
      Object.defineProperty(out, k, {
        value: d,
        enumerable: true,
        writable: true,
        configurable: true,
      });
    }
  }
  seen.delete(v);
  return out;
}

/** A returned table: named columns of equal length (numbers, NaN for missing) and their units. */
function toTable(v, budget) {
  if (v === null || typeof v !== "object" || Array.isArray(v)) {
    throw new Refused(
      "returned a value that is not a table: give { columns: { name: numbers, … }, units? }",
    );
  }
  const cols = v.columns;
  if (cols === null || typeof cols !== "object" || Array.isArray(cols)) {
    throw new Refused("returned a table without columns: give { columns: { name: numbers, … } }");
  }
  const names = Object.keys(cols);
  if (names.length === 0) throw new Refused("returned a table with no columns");
  const columns = {};
  let n = -1;
  for (const name of names) {
    const c = cols[name];
    if (!Array.isArray(c) && !(ArrayBuffer.isView(c) && !(c instanceof DataView))) {
      throw new Refused(`returned a table whose column "${name}" is not a list of numbers`);
    }
    if (n >= 0 && c.length !== n) {
      throw new Refused(
        `returned a table whose columns differ in length: "${
          names[0]
        }" has ${n} rows, "${name}" has ${c.length}`,
      );
    }
    n = c.length;
    budget.left -= c.length * 12;
    if (budget.left < 0) throw new Refused("too-large");
    const a = new Float64Array(c.length);
    for (let i = 0; i < c.length; i++) {
      const x = c[i];
      if (x === null || x === undefined) a[i] = NaN;
      else if (typeof x === "number") a[i] = x;
      else if (typeof x === "bigint" || ArrayBuffer.isView(c)) a[i] = Number(x);
      else {throw new Refused(
          `returned a table whose column "${name}" holds a ${typeof x} in row ${i + 1}`,
        );}
    }
    Object.defineProperty(columns, name, { value: { [F64]: toBase64(a) }, enumerable: true });
  }
  const units = {};
  const u = v.units;
  if (u !== undefined && u !== null) {
    if (typeof u !== "object" || Array.isArray(u)) {
      throw new Refused("returned table units that are not { column: unit }");
    }
    for (const k of Object.keys(u)) {
      if (!names.includes(k)) {
        throw new Refused(`returned a unit for "${k}", which is not one of the table's columns`);
      }
      if (typeof u[k] !== "string") {
        throw new Refused(`returned a unit for "${k}" that is not text`);
      }
      Object.defineProperty(units, k, { value: u[k], enumerable: true });
    }
  }
  return { columns, units, names };
}

const DENIED = {
  read: "tried to read a file; calc cells cannot touch the disk",
  write: "tried to write a file; calc cells cannot touch the disk",
  net: "tried to reach the network; calc cells have no network",
  import: "tried to load a module from the network; calc cells cannot import",
  env: "tried to read an environment variable; calc cells see no environment",
  sys: "tried to read facts about the machine; calc cells cannot",
  run: "tried to start a process; calc cells cannot",
  ffi: "tried to load a native library; calc cells cannot",
};

/** The answer for an error thrown by user code, with its line in the program when known. */
function failure(err) {
  const message = err instanceof Error ? err.message : String(err);
  const name = err instanceof Error ? err.name : "";
  let why = "threw";
  let said = `${name && name !== "Error" ? name + ": " : ""}${message}`;
  const perm = /Requires (\w+) access/.exec(message);
  if (name === "NotCapable" || perm) {
    why = "denied";
    said = DENIED[perm?.[1] ?? ""] ?? `was refused: ${message}`;
  } else if (/Failed to spawn/.test(message)) {
    why = "denied";
    said = DENIED.run;
  } else if (name === "EvalError" || /Code generation from strings/.test(message)) {
    why = "denied";
    said = "tried to build code from text (eval or Function); calc cells cannot";
  } else if (err instanceof Refused) {
    why = message === "too-large" ? "too-large" : "not-data";
  } else if (err instanceof RangeError && /string length|Array buffer|allocation/i.test(message)) {
    why = "memory";
  }
  const stack = err instanceof Error && typeof err.stack === "string" ? err.stack : "";
  const at = /data:application\/typescript[^\s)]*?:(\d+):(\d+)\)?/.exec(stack);
  return {
    ok: false,
    why,
    message: said,
    line: at ? Number(at[1]) : null,
    column: at ? Number(at[2]) : null,
  };
}

function closeWaysOut() {
  for (const name of ["Worker", "localStorage", "sessionStorage", "caches", "BroadcastChannel"]) {
    try {
      delete globalThis[name];
    } catch { /* not deletable: it stays, still without permissions */ }
  }
  const stop = () => {
    throw new Refused("exit");
  };
  try {
    Object.defineProperty(Deno, "exit", { value: stop });
  } catch { /* frozen: the parent reports an ending without an answer */ }
  try {
    if (globalThis.process) Object.defineProperty(globalThis.process, "exit", { value: stop });
  } catch { /* as above */ }
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

function answer(nonce, obj) {
  stdout.writeSync(encoder.encode(nonce));
  const text = JSON.stringify(obj) + "\n";
  const bytes = encoder.encode(text);
  for (let i = 0; i < bytes.length;) i += stdout.writeSync(bytes.subarray(i));
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
const raw = await new Response(Deno.stdin.readable).text();
if (raw.length === 0) realExit(0); // the parent ended before handing a job over
const job = JSON.parse(raw, revive);
const kept = captureConsole(job.consoleLimit);
closeWaysOut();
let reply;
try {
  let bin = "";
  const bytes = encoder.encode(job.program);
  for (let i = 0; i < bytes.length; i += 8192) {
    bin += String.fromCharCode.apply(null, bytes.subarray(i, i + 8192));
  }
  const mod = await import("data:application/typescript;base64," + btoa(bin));
  const value = await mod.default(job.input);
  const budget = { left: job.resultLimit };
  const data = job.gives === "table"
    ? toTable(value, budget)
    : toData(value, "value", new Set(), budget, 0);
  reply = { ok: true, value: data };
} catch (err) {
  reply = err instanceof Refused && err.message === "exit"
    ? {
      ok: false,
      why: "exit",
      message: "tried to end its process; calc cells return a value instead",
    }
    : failure(err);
}
answer(job.nonce, { ...reply, console: kept.text, consoleCut: kept.cut });
realExit(0);
