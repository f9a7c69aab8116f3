/**
 * FileStore.read() refuses what is not a regular file inside the document's
 * folder, in words, without opening a named pipe for a blocking read (issue
 * 11, defect 10; the race itself is files_race_test.ts).
 *
 * @module
 */
import { equal, rejects } from "node:assert/strict";
import { CellError } from "../errors.ts";
import { FileStore, lineCount } from "./files.ts";

async function withFolder(fn: (dir: string, root: string) => Promise<void>) {
  const root = await Deno.makeTempDir({ prefix: "plumb-files-" });
  await Deno.mkdir(`${root}/doc/data`, { recursive: true });
  await Deno.writeTextFile(`${root}/secret.csv`, "s\n1\n");
  await Deno.writeTextFile(`${root}/doc/data/a.csv`, "x\n1\n");
  try {
    await fn(`${root}/doc`, root);
  } finally {
    await Deno.remove(root, { recursive: true });
  }
}

const refused = (message: string) => (e: unknown) =>
  e instanceof CellError && e.message === message;

Deno.test({
  name: "FileStore.read() refuses a named pipe at once, and reads the file again once replaced",
  ignore: Deno.build.os === "windows",
  async fn() {
    await withFolder(async (dir) => {
      await new Deno.Command("mkfifo", { args: [`${dir}/pipe.csv`] }).output();
      const store = new FileStore(dir);
      await rejects(
        store.read("pipe.csv", ["from"], 1 << 20),
        refused(`"pipe.csv" is not a regular file: it is a named pipe`),
      );
      await Deno.remove(`${dir}/pipe.csv`);
      await Deno.writeTextFile(`${dir}/pipe.csv`, "x\n2\n");
      equal(
        new TextDecoder().decode((await store.read("pipe.csv", ["from"], 1 << 20)).bytes),
        "x\n2\n",
      );
    });
  },
});

Deno.test("FileStore.read() refuses a link out of the folder and a folder, reads a link inside", async () => {
  await withFolder(async (dir, root) => {
    await Deno.symlink(`${root}/secret.csv`, `${dir}/out.csv`);
    await Deno.symlink(`${dir}/data/a.csv`, `${dir}/in.csv`);
    await Deno.symlink(root, `${dir}/up`);
    const store = new FileStore(dir);
    await rejects(
      store.read("out.csv", ["from"], 1 << 20),
      refused(`File "out.csv" links outside the document's folder`),
    );
    await rejects(
      store.read("up/secret.csv", ["from"], 1 << 20),
      refused(`File "up/secret.csv" links outside the document's folder`),
    );
    await rejects(
      store.read("data", ["from"], 1 << 20),
      refused(`"data" is not a regular file: it is a folder`),
    );
    const inside = await store.read("in.csv", ["from"], 1 << 20);
    equal(new TextDecoder().decode(inside.bytes), "x\n1\n");
    equal(inside.path, "in.csv");
  });
});

Deno.test("FileStore.read() gives the cached bytes for an unchanged file, new bytes for a replaced one", async () => {
  await withFolder(async (dir) => {
    const store = new FileStore(dir);
    const first = await store.read("data/a.csv", ["from"], 1 << 20);
    equal((await store.read("data/a.csv", ["from"], 1 << 20)).sha256, first.sha256);
    // Same size, and the same modification time forced: a new file (another inode) is read anew.
    const mtime = (await Deno.stat(`${dir}/data/a.csv`)).mtime!;
    await Deno.writeTextFile(`${dir}/data/b.csv`, "x\n9\n");
    await Deno.utime(`${dir}/data/b.csv`, mtime, mtime);
    await Deno.rename(`${dir}/data/b.csv`, `${dir}/data/a.csv`);
    const again = await store.read("data/a.csv", ["from"], 1 << 20);
    equal(new TextDecoder().decode(again.bytes), "x\n9\n");
    await rejects(
      store.read("data/a.csv", ["from"], 3),
      refused(
        `File "data/a.csv" is 4 bytes, over the limit of 3 bytes (set max_file_size in the front matter to raise it)`,
      ),
    );
  });
});

Deno.test("FileStore.read() reads into shared memory once, hashing and counting lines as it reads", async () => {
  // Source: SHA-256 by crypto.subtle over a copy (FIPS 180-4); lines counted by splitting the text.
  await withFolder(async (dir) => {
    const text = Array.from({ length: 250_000 }, (_, i) => `${i},${i / 7}`).join("\n"); // > 4 MiB: two chunks
    await Deno.writeTextFile(`${dir}/big.csv`, text);
    const store = new FileStore(dir);
    const data = await store.read("big.csv", ["from"], 1 << 30);
    equal(data.bytes.buffer instanceof SharedArrayBuffer, true);
    equal(data.bytes.length, new TextEncoder().encode(text).length);
    const digest = new Uint8Array(await crypto.subtle.digest("SHA-256", data.bytes.slice()));
    equal(data.sha256, Array.from(digest, (b) => b.toString(16).padStart(2, "0")).join(""));
    equal(lineCount(data.bytes), text.split("\n").length); // no final line feed: one more line
    equal(lineCount(new TextEncoder().encode("a\nb\n")), 2);
    equal(lineCount(new Uint8Array()), 0);
  });
});
