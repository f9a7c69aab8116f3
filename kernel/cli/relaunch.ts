/**
 * Runs the `plumb` entry again in a new process with a narrower list of
 * permissions (`new` and `export` write only their target folder; the
 * command that starts them may not write at all), its output passed
 * through.
 *
 * @module
 */
import { join } from "node:path";
import { fileURLToPath as fromFileUrl } from "node:url";
import type { Product } from "./product.ts";

const REPO = fromFileUrl(new URL("../../", import.meta.url)).replace(/\/$/, "");

/**
 * Whether this process may start Deno again.
 *
 * @returns True when running this Deno is allowed.
 */
export function mayRelaunch(): boolean {
  return Deno.permissions.querySync({ name: "run", command: Deno.execPath() }).state === "granted";
}

/**
 * Relaunches the product's entry with the given permissions and arguments.
 *
 * @param product The entry module.
 * @param permissions `--allow-…` flags (`--no-prompt` is always added).
 * @param args The command and its arguments.
 * @returns The child's exit status.
 */
export async function relaunch(
  product: Pick<Product, "mainUrl">,
  permissions: string[],
  args: string[],
): Promise<number> {
  const child = await new Deno.Command(Deno.execPath(), {
    args: [
      "run",
      `--config=${join(REPO, "deno.json")}`,
      "--no-prompt",
      ...permissions,
      fromFileUrl(product.mainUrl),
      ...args,
    ],
    stdin: "null",
    stdout: "inherit",
    stderr: "inherit",
  }).output();
  return child.code;
}
