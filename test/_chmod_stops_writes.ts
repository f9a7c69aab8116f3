/**
 * Whether a folder's permission bits stop this process writing in it: not
 * for root, which writes through them (tests then cause the failure another
 * way, or say why they are skipped).
 *
 * @module
 */
import { join } from "node:path";

/**
 * Tries to write into a fresh folder made read-only.
 *
 * @returns True when the write was refused.
 */
export async function chmodStopsWrites(): Promise<boolean> {
  const dir = await Deno.makeTempDir();
  try {
    await Deno.chmod(dir, 0o555);
    await Deno.writeTextFile(join(dir, "probe"), "x");
    return false;
  } catch {
    return true;
  } finally {
    await Deno.chmod(dir, 0o755);
    await Deno.remove(dir, { recursive: true });
  }
}
