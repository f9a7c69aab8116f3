/**
 * Copying an example folder for a test to work in.
 *
 * @module
 */

/**
 * Copies a folder (an example) without the run history a local run may have
 * left in it: a copy starts with none.
 *
 * @param from The folder.
 * @param to Where the copy goes (made if missing).
 */
export function copyDir(from: string, to: string): void {
  Deno.mkdirSync(to, { recursive: true });
  for (const e of Deno.readDirSync(from)) {
    if (e.isDirectory) copyDir(`${from}/${e.name}`, `${to}/${e.name}`);
    else if (e.isFile && !e.name.endsWith(".history.jsonl")) {
      Deno.copyFileSync(`${from}/${e.name}`, `${to}/${e.name}`);
    }
  }
}
