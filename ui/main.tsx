/**
 * The live page's entry point (bundled by the server with esbuild): puts the
 * style sheet in the page, mounts the app on `#plumb` (or the body) and
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

const store = new LiveStore();
const root = document.getElementById("plumb") ?? document.body;
render(<App store={store} />, root);
startClock();
connectLive(store);
