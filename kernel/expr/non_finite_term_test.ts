import assert from "node:assert/strict";
import { format, nonFiniteTerm, parseExpression } from "./mod.ts";

Deno.test("nonFiniteTerm() finds the innermost term that is not finite and its rows", () => {
  const t = [[0, 1, 2, 0]];
  const at = (text: string, values: number[]) => {
    const r = nonFiniteTerm(parseExpression(text), ["t"], ["a", "b"], t, values, 4);
    return r === null ? null : { term: format(r.term), rows: r.rows, names: [...r.names] };
  };
  assert.deepEqual(at("a + b*log(t)", [1, 2]), { term: "log(t)", rows: [0, 3], names: ["t"] });
  // exp overflows at t = 1, 2 only: the exp, not its finite argument, is named.
  assert.deepEqual(at("a*exp(b*t)", [1, 1000]), {
    term: "exp(b * t)",
    rows: [1, 2],
    names: ["b", "t"],
  });
  // 1/(t − a) at t = a: the division.
  assert.deepEqual(at("b/(t - a)", [2, 1]), {
    term: "b / (t - a)",
    rows: [2],
    names: ["b", "t", "a"],
  });
  assert.equal(at("a*exp(-b*t)", [1, 1]), null);
  // A term that is 0·∞ in the model itself is named at its own node (the model has no limit).
  assert.deepEqual(at("t*log(t)", [0, 0]), { term: "log(t)", rows: [0, 3], names: ["t"] });
});
