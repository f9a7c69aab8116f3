/**
 * The live page's entry point (bundled by the server with esbuild): puts the
 * style sheet in the page, mounts the app on `#app` (or the body) and
 * connects to `/live`.
 *
 * @module
 */
import { render } from "preact";
import { App } from "./app.tsx";
import { startClock } from "./clock.ts";
import { connectLive } from "./live.ts";
import { LiveStore } from "./store.ts";
import { STYLE } from "./style.ts";

const style = document.createElement("style");
style.textContent = STYLE;
document.head.appendChild(style);
// No icon to fetch (the browser would otherwise ask the server for /favicon.ico).
const icon = document.createElement("link");
icon.rel = "icon";
icon.href = "data:,";
document.head.appendChild(icon);

const store = new LiveStore();
const root = document.getElementById("app") ?? document.body;
render(<App store={store} />, root);
startClock();
connectLive(store);
