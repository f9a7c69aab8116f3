/**
 * The reference in docs/ against the code: option tables against each kind's
 * declared options (both ways, with types and whether required), the function
 * table against kernel/expr's public functions, the settings table against
 * the settings reader, and every command in a ```sh block of the README and
 * docs against the tasks, `plumb` subcommands and flags that exist.
 */
import { deepEqual, equal, ok } from "node:assert/strict";
import { registry } from "../../cells/mod.ts";
import { CONSTANTS, FUNCTIONS, PUBLIC_FUNCTIONS } from "../../kernel/expr/mod.ts";
import { parseDocument, readSettings } from "../../kernel/document/mod.ts";

const ROOT = new URL("../../", import.meta.url);
const read = (path: string) => Deno.readTextFileSync(new URL(path, ROOT));

/** Rows of the Markdown tables in a text, each a list of trimmed cells. */
function tableRows(text: string): string[][] {
  return text.split("\n").filter((l) => /^\|.*\|\s*$/.test(l) && !/^\|\s*-/.test(l))
    .map((l) => l.trim().slice(1, -1).split(/(?<!\\)\|/).map((c) => c.trim()));
}

/** The options documented per kind: `## \`kind\`` sections of docs/cells.md. */
function documentedOptions(): Map<string, Map<string, string[]>> {
  const out = new Map<string, Map<string, string[]>>();
  const sections = read("docs/cells.md").split(/^## /m).slice(1);
  for (const s of sections) {
    const kind = /^`([a-z]+)`/.exec(s)?.[1];
    if (!kind) continue;
    const rows = new Map<string, string[]>();
    for (const r of tableRows(s)) {
      const key = /^`([a-z_]+)`$/.exec(r[0])?.[1];
      if (key) rows.set(key, r);
    }
    out.set(kind, rows);
  }
  return out;
}

Deno.test("docs/cells.md documents every kind and every declared option, and nothing else", () => {
  const docs = documentedOptions();
  deepEqual([...docs.keys()].sort(), [...registry.keys()].sort());
  for (const [kind, k] of registry) {
    const declared = k.options as Record<string, { type: string; required?: boolean }>;
    const rows = docs.get(kind)!;
    deepEqual([...rows.keys()].sort(), Object.keys(declared).sort(), `options of ${kind}`);
    for (const [key, decl] of Object.entries(declared)) {
      const [, type, def, what, example] = rows.get(key)!;
      ok(type.startsWith(decl.type), `${kind}.${key}: type "${type}" is not ${decl.type}`);
      equal(def === "required", decl.required === true, `${kind}.${key}: required`);
      ok(what.length > 0, `${kind}.${key}: a line of documentation`);
      ok(example.startsWith(`\`${key}:`), `${kind}.${key}: example "${example}"`);
    }
  }
});

Deno.test("docs/expressions.md lists exactly the public functions and the constants", () => {
  const text = read("docs/expressions.md");
  const fnSection = text.split("## Functions")[1].split("## ")[0];
  const documented = tableRows(fnSection).map((r) => /^`([a-z0-9]+)`$/.exec(r[0])?.[1])
    .filter((n): n is string => n !== undefined);
  deepEqual(documented.sort(), [...PUBLIC_FUNCTIONS].sort());
  for (const r of tableRows(fnSection)) {
    const name = /^`([a-z0-9]+)`$/.exec(r[0])?.[1];
    if (name) equal(Number(r[1]), FUNCTIONS.get(name)?.arity, `arity of ${name}`);
  }
  const constSection = text.split("## Constants")[1].split("## ")[0];
  const consts = tableRows(constSection).map((r) => /^`([a-z]+)`$/.exec(r[0])?.[1])
    .filter((n): n is string => n !== undefined);
  deepEqual(consts.sort(), [...CONSTANTS.keys()].sort());
  ok(text.includes("`polynomial(x, 3)`") && text.includes("`linear(x1, x2, x3)`"));
});

Deno.test("docs/settings.md lists exactly the settings the reader knows", () => {
  const documented = tableRows(read("docs/settings.md"))
    .map((r) => /^`([a-z_]+)`$/.exec(r[0])?.[1]).filter((n): n is string => n !== undefined);
  const source = read("kernel/document/read_settings.ts");
  const known = /const KNOWN = new Set\(\[([^\]]*)\]\)/.exec(source)![1]
    .match(/"([a-z_]+)"/g)!.map((s) => s.slice(1, -1));
  deepEqual(documented.sort(), known.sort());
  // Each documented key is read as a setting (a wrong value is an error), never kept as extra.
  for (const key of documented) {
    const doc = parseDocument(`---\n${key}: [1, 2]\n---\n`);
    const { settings, errors } = readSettings(doc);
    ok(!(key in settings.extra), `${key} is a setting`);
    equal(errors.length, 1, `${key}: a list is refused`);
  }
});

/** Every shell command line in the README's and the docs' ```sh blocks. */
function shellCommands(): { file: string; line: string }[] {
  const files = [
    "README.md",
    "examples/README.md",
    ...[...Deno.readDirSync(new URL("docs/", ROOT))].map((f) => `docs/${f.name}`),
  ];
  const out = [];
  for (const file of files) {
    for (const block of read(file).matchAll(/```sh\n([\s\S]*?)```/g)) {
      for (const raw of block[1].split("\n")) {
        const line = raw.replace(/\s+#.*$/, "").trim();
        if (line) out.push({ file, line });
      }
    }
  }
  return out;
}

Deno.test("every command the README and docs show exists", () => {
  const tasks = Object.keys(JSON.parse(read("deno.json")).tasks);
  const main = read("kernel/cli/main.ts");
  const cliSource = [...Deno.readDirSync(new URL("kernel/cli/", ROOT))]
    .filter((f) => f.name.endsWith(".ts")).map((f) => read(`kernel/cli/${f.name}`)).join("\n");
  const commands = shellCommands();
  ok(commands.length >= 10, `${commands.length} commands`);
  for (const { file, line } of commands) {
    const words = line.split(/\s+/);
    equal(words.slice(0, 3).join(" "), "npx -y deno@2.9.6", `${file}: ${line}`);
    if (words[3] === "task") {
      ok(tasks.includes(words[4]), `${file}: no task "${words[4]}" in deno.json (${line})`);
      if (words[4] === "plumb") {
        ok(main.includes(`command === "${words[5]}"`), `${file}: no plumb ${words[5]} (${line})`);
      }
      for (const flag of words.slice(5).filter((w) => w.startsWith("--"))) {
        ok(cliSource.includes(`"${flag}"`), `${file}: no flag ${flag} (${line})`);
      }
      for (const path of words.filter((w) => /^examples\/.*\.md$/.test(w))) {
        ok(Deno.statSync(new URL(path, ROOT)).isFile, `${file}: ${path}`);
      }
    } else {
      equal(words[3], "run", `${file}: ${line}`);
      ok(Deno.statSync(new URL(words[words.length - 1], ROOT)).isFile, `${file}: ${line}`);
    }
  }
});

Deno.test("the README links the reference and carries the caution", () => {
  const readme = read("README.md");
  ok(readme.includes("](docs/README.md)"));
  ok(
    readme.includes("npx -y deno@2.9.6 task start") &&
      readme.includes("npx -y deno@2.9.6 task test"),
  );
  ok(/validated procedures/.test(readme) && /validated procedures/.test(read("docs/README.md")));
});
