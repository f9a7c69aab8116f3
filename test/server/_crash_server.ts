/**
 * `startServer` in a process of its own, for the crash-safety suite (which
 * kills it with SIGKILL): prints `{"port", "token"}` on one line once it
 * listens, then serves until killed.
 *
 * Usage: `deno run --allow-read --allow-write --allow-net=127.0.0.1 --allow-env _crash_server.ts <document>`
 *
 * @module
 */
import { registry } from "../../cells/mod.ts";
import { startServer } from "../../kernel/server/server.ts";

const server = await startServer({
  document: Deno.args[0],
  registry,
  workerUrl: new URL("../../cells/worker.ts", import.meta.url),
  bundle: null,
});
console.log(JSON.stringify({ port: server.port, token: server.token }));
