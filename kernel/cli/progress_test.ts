import { deepEqual, equal } from "node:assert/strict";
import { progressLine, progressWriter } from "./progress.ts";
import type { SessionEvent } from "../session/types.ts";

/** A writer on a hand-driven clock, and what it wrote. */
function harness(terminal: boolean) {
  const written: string[] = [];
  let clock = 0;
  const listen = progressWriter((t) => written.push(t), { terminal, now: () => clock });
  const at = (ms: number, e: SessionEvent) => {
    clock = ms;
    listen(e);
  };
  return { written, at };
}

const computing = (name: string, fraction?: number, note?: string): SessionEvent => ({
  name,
  state: "computing",
  ...(fraction === undefined ? {} : { fraction }),
  ...(note === undefined ? {} : { note }),
});

Deno.test("progressLine() gives the whole percent done, clamped, and the cell's note", () => {
  // Expected texts: exact arithmetic (floor of 100 × fraction).
  equal(progressLine("s", 0.999), "computing s 99%");
  equal(progressLine("s", 1.2, "refitting"), "computing s 100% · refitting");
  equal(progressLine("s", -0.1), "computing s 0%");
});

Deno.test("progressWriter() into a file writes a line a cell at most every second", () => {
  const { written, at } = harness(false);
  at(0, computing("a")); // the start of computing carries no fraction: nothing
  at(100, computing("a", 0.1, "1 of 10"));
  at(600, computing("a", 0.5, "5 of 10")); // within a second of the last: dropped
  at(700, computing("b", 0.2)); // another cell has its own second
  at(1100, computing("a", 0.9, "9 of 10"));
  at(1200, { name: "a", state: "current" });
  deepEqual(written, [
    "computing a 10% · 1 of 10\n",
    "computing b 20%\n",
    "computing a 90% · 9 of 10\n",
  ]);
});

Deno.test("progressWriter() in a terminal writes over one line and erases it when the cell settles", () => {
  const { written, at } = harness(true);
  at(100, computing("a", 0.1));
  at(200, computing("a", 0.15)); // 100 ms after the last: dropped (200 ms in a terminal)
  at(300, computing("a", 0.3));
  at(350, { name: "other", state: "current" }); // not the cell on screen: nothing
  at(400, { name: "a", state: "failed" });
  at(500, { name: "a", state: "current" }); // already erased: nothing
  deepEqual(written, ["\r\x1b[2Kcomputing a 10%", "\r\x1b[2Kcomputing a 30%", "\r\x1b[2K"]);
});
