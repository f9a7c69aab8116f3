import { equal, ok } from "node:assert/strict";
import { hasGnuTime, measure } from "./measure.ts";

// A child that touches 150 MiB and holds it for 300 ms (long enough for the
// /proc reading every 50 ms), then prints a word and exits with status 3.
const CHILD = [
  Deno.execPath(),
  "eval",
  "const a = new Uint8Array(150 * 2 ** 20).fill(1); await new Promise((r) => setTimeout(r, 300));" +
  "console.log('held', a[12345]); Deno.exit(3);",
];

const gnuTime = await hasGnuTime();

for (const peak of ["time", "proc"] as const) {
  Deno.test({
    name: `measure() reads a child's peak memory by ${peak}, its exit code and output`,
    ignore: peak === "time" && !gnuTime,
    async fn() {
      const m = await measure(CHILD, { peak });
      equal(m.code, 3);
      equal(m.stdout.trim(), "held 1");
      ok(m.peakMb !== null && m.peakMb >= 150, `peak ${m.peakMb} MB, touched 150 MiB`);
      ok(m.peakMb! < 150 + 400, `peak ${m.peakMb} MB: the runtime takes well under 400 MB more`);
      ok(m.ms > 300, "wall time covers the 300 ms the child waits");
      // Filling 150 MiB takes processor time; the 300 ms of waiting takes none.
      if (peak === "time") {
        ok(m.cpuMs !== null && m.cpuMs > 0 && m.cpuMs < m.ms, `cpu ${m.cpuMs} ms`);
      } else equal(m.cpuMs, null);
    },
  });
}

Deno.test("measure() sends standard output to /dev/null when told", async () => {
  const m = await measure([Deno.execPath(), "eval", "console.log('x'.repeat(1000))"], {
    stdout: "null",
  });
  equal(m.code, 0);
  equal(m.stdout, "");
});
