import { deepEqual, ok } from "node:assert/strict";
import { spreadLabels } from "./_labels.ts";

function minGap(y: number[]): number {
  const s = [...y].sort((a, b) => a - b);
  return Math.min(...s.slice(1).map((v, i) => v - s[i]));
}

Deno.test("spreadLabels() leaves labels that do not collide where they want to be", () => {
  deepEqual(spreadLabels([40, 10, 80], 12, 0, 100), [40, 10, 80]);
});

Deno.test("spreadLabels() centres a colliding pair on its wishes", () => {
  deepEqual(spreadLabels([100, 104], 12, 0, 400), [96, 108]);
});

Deno.test("spreadLabels() merges groups that collide after centring, and keeps the order", () => {
  const wanted = [100, 101, 102, 112, 113];
  const y = spreadLabels(wanted, 12, 0, 400);
  ok(minGap(y) >= 12 - 1e-9, String(y));
  for (let i = 1; i < y.length; i++) ok(y[i] > y[i - 1], "order along the axis kept");
});

Deno.test("spreadLabels() keeps labels inside the panel at its edges", () => {
  const y = spreadLabels([2, 3, 4], 12, 0, 400);
  deepEqual(y, [0, 12, 24]);
  const z = spreadLabels([398, 399], 12, 0, 400);
  deepEqual(z, [388, 400]);
});

Deno.test("spreadLabels() never overlaps on seeded random wishes (property)", () => {
  // Park–Miller minimal standard generator (Park & Miller 1988, CACM 31(10)).
  let s = 7;
  const r = () => (s = (s * 16807) % 2147483647) / 2147483647;
  for (let t = 0; t < 200; t++) {
    const n = 1 + Math.floor(r() * 8);
    const wanted = Array.from({ length: n }, () => r() * 300);
    const y = spreadLabels(wanted, 11, 0, 300);
    if (n > 1) ok(minGap(y) >= 11 - 1e-9, `${wanted} → ${y}`);
    ok(y.every((v) => v >= 0 && v <= 300), `inside: ${y}`);
    const byWish = wanted.map((_, i) => i).sort((a, b) => wanted[a] - wanted[b] || a - b);
    for (let i = 1; i < n; i++) ok(y[byWish[i]] > y[byWish[i - 1]], "order kept");
  }
});
