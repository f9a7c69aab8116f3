/**
 * `plumb new <document.md>`: writes a new analysis and its invented data
 * beside it (`new_document.ts`), refusing to overwrite either.
 *
 * Least privilege: the `plumb` task and the installed command are given no
 * write permission at all. `new` relaunches itself with write (and read)
 * permission for the target folder only, as `serve` relaunches itself with
 * its narrowed lists:
 *
 * ```
 *  plumb new notes/leak.md            (may read, run Deno; may not write)
 *     │ resolves notes/leak.md from the user's folder, relaunches:
 *     ▼
 *  deno run --no-prompt --allow-read=<folder> --allow-write=<folder>
 *           main.ts new <folder>/leak.md --narrowed
 * ```
 *
 * A process already allowed to write the folder writes in place; one allowed
 * neither to write nor to run Deno says so in one line.
 *
 * @module
 */
import { basename, dirname, join } from "node:path";
import { fileTrouble, fromCaller } from "./caller.ts";
import { newDocument } from "./new_document.ts";
import type { Product } from "./product.ts";
import { mayRelaunch, relaunch } from "./relaunch.ts";

const USAGE = "Usage: plumb new <document.md>";

/**
 * Runs `plumb new` with its arguments.
 *
 * @param args Arguments after `new`.
 * @param product The entry module to relaunch.
 * @returns The exit status: 0 when both files were written, 2 otherwise.
 */
export async function newCommand(args: string[], product: Product): Promise<number> {
  // `--narrowed` and `--as <path as the user gave it>` are the relaunch's own options.
  const narrowed = args.includes("--narrowed");
  const shown = args.indexOf("--as");
  const paths = args.filter((a, i) =>
    a !== "--narrowed" && (shown < 0 || i < shown || i > shown + 1)
  );
  const unknown = paths.find((a) => a.startsWith("-"));
  if (paths.length !== 1 || unknown) {
    console.error(unknown ? `Unknown option "${unknown}"` : USAGE);
    return 2;
  }
  const path = fromCaller(paths[0]);
  const given = narrowed && shown >= 0 ? args[shown + 1] ?? paths[0] : paths[0];
  const folder = dirname(path);
  const mayWrite = Deno.permissions.querySync({ name: "write", path: folder }).state === "granted";
  if (mayWrite) return await writeNew(given, path);
  if (narrowed || !mayRelaunch()) {
    console.error(
      `Cannot write "${given}": Plumb was not given permission to write to "${folder}"`,
    );
    return 2;
  }
  return await relaunch(product, [`--allow-read=${folder}`, `--allow-write=${folder}`], [
    "new",
    path,
    "--narrowed",
    "--as",
    given,
  ]);
}

/**
 * Writes the document and its data, or neither: both names are checked
 * first, each file is created only if absent (`createNew`), and the
 * document is removed again if its data cannot be written.
 */
async function writeNew(given: string, path: string): Promise<number> {
  const files = newDocument(basename(path));
  const dataPath = join(dirname(path), files.dataName);
  const folder = dirname(given) === "." ? "this folder" : `folder "${dirname(given)}"`;
  const dataGiven = join(dirname(given), files.dataName);
  for (const [name, p] of [[given, path], [dataGiven, dataPath]]) {
    const there = await Deno.lstat(p).then(() => true, () => false);
    if (there) {
      console.error(`Will not overwrite "${name}": it exists (nothing was written)`);
      return 2;
    }
  }
  const trouble = await folderTrouble(dirname(path), dirname(given));
  if (trouble) {
    console.error(`Cannot write "${given}": ${trouble}`);
    return 2;
  }
  try {
    await Deno.writeTextFile(path, files.document, { createNew: true });
  } catch (err) {
    console.error(`Cannot write "${given}" in ${folder}: ${fileTrouble(err)}`);
    return 2;
  }
  try {
    await Deno.writeTextFile(dataPath, files.data, { createNew: true });
  } catch (err) {
    await Deno.remove(path).catch(() => {});
    console.error(`Cannot write "${dataGiven}" in ${folder}: ${fileTrouble(err)}`);
    return 2;
  }
  console.log(
    `Wrote ${given} and ${dataGiven} (invented readings: replace them with yours)\n\n` +
      `  plumb run ${given}      run every cell and print the results\n` +
      `  plumb serve ${given}    work on it live in the browser`,
  );
  return 0;
}

/** Why files cannot go into a folder, in a few words; null when it is a folder. */
async function folderTrouble(folder: string, givenFolder: string): Promise<string | null> {
  try {
    return (await Deno.stat(folder)).isDirectory ? null : `"${givenFolder}" is not a folder`;
  } catch (err) {
    if (err instanceof Deno.errors.NotFound) return `no folder "${givenFolder}"`;
    return `folder "${givenFolder}": ${fileTrouble(err)}`;
  }
}
