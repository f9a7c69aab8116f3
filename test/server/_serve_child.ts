/**
 * A live server in its own process, for suites that must watch the whole
 * process (its file limit, its memory, whether it exits): serves the document
 * given as the first argument and prints one JSON line `{port, token, pid}`.
 * A second argument, JSON, is merged into the server's options (limits).
 *
 * @module
 */
import { registry } from "../../cells/mod.ts";
import { startServer } from "../../kernel/server/server.ts";

const [document, extra] = Deno.args;
const server = await startServer({
  document,
  registry,
  workerUrl: new URL("../../cells/worker.ts", import.meta.url),
  bundle: null,
  debounceMs: 5,
  ...(extra ? JSON.parse(extra) : {}),
});
await server.ready;
console.log(JSON.stringify({ port: server.port, token: server.token, pid: Deno.pid }));
