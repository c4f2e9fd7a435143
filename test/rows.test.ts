import { describe, it, expect } from "vitest";
import { csvCell, csvLine } from "../src/topology/rows";
import { uniformSource } from "../src/demo/random";

describe("table cells", () => {
  it("writes numbers with 10 significant digits, as String(Number(v.toPrecision(10))) does", () => {
    // The definition of the cell format (common practice: round to 10 digits, then JavaScript's
    // shortest round-trip form, with toPrecision per ECMA-262 Number.prototype.toPrecision);
    // the fast path finds the ten digits without toPrecision where they are plain.
    const rand = uniformSource(2026);
    const values = [0.1, 0.5, -2.25, 1.0000000001, 2.9999999999, 123456789.5, 9999999999.5, -2003812220.18,
      0.000001234, -0.0000049999, 1e-7 + 1e-9, 1e21 + 0.5, -1e-300, 5e-324, Number.MAX_VALUE / 3];
    for (let i = 0; i < 30000; i++) {
      values.push((rand() - 0.5) * 10 ** Math.floor(rand() * 44 - 22), Math.round(rand() * 1e6) / 1000, rand());
    }
    // Near ties of the tenth digit, a last bit either side, and values next to powers of ten
    // (where the exponent or the digit count changes), both signs.
    for (let i = 0; i < 20000; i++) {
      const k = Math.floor(rand() * 22) - 6, n = 1e9 + Math.floor(rand() * 9e9);
      const tie = (n + 0.5) / 10 ** (9 - k);
      const near = 10 ** k * (1 + (rand() - 0.5) * 1e-9);
      const below = 10 ** k * (1 - 2 ** -52), above = 10 ** k * (1 + 2 ** -52);
      for (const x of [tie, tie * (1 + 2 ** -52), tie * (1 - 2 ** -52), near, 10 ** k - 10 ** (k - 10) / 2, below, above]) values.push(x, -x);
    }
    let checked = 0;
    for (const v of values) {
      const want = Number.isInteger(v) ? String(v) : String(Number(v.toPrecision(10)));
      if (csvCell(v) !== want) expect.fail(`${v}: wrote ${csvCell(v)}, expected ${want}`);
      checked++;
    }
    expect(checked).toBe(values.length);
    expect(csvCell(NaN)).toBe("");
    expect(csvCell(Infinity)).toBe("");
    expect(csvLine([1, 0.25, "a,b", 'say "x"'])).toBe('1,0.25,"a,b","say ""x"""\n');
  });
});
