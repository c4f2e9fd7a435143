import { describe, it, expect } from "vitest";
import { csvCell, csvLine } from "../src/topology/rows";
import { uniformSource } from "../src/demo/random";

describe("table cells", () => {
  it("writes numbers with 10 significant digits, as String(Number(v.toPrecision(10))) does", () => {
    // The definition of the cell format (common practice: round to 10 digits, then JavaScript's
    // shortest round-trip form); the fast path skips the parse where the digits are fixed.
    const rand = uniformSource(2026);
    const values = [0.1, 0.5, -2.25, 1.0000000001, 2.9999999999, 123456789.5, 9999999999.5, -2003812220.18,
      0.000001234, -0.0000049999, 1e-7 + 1e-9, 1e21 + 0.5, -1e-300, 5e-324, Number.MAX_VALUE / 3];
    for (let i = 0; i < 30000; i++) {
      values.push((rand() - 0.5) * 10 ** Math.floor(rand() * 44 - 22), Math.round(rand() * 1e6) / 1000, rand());
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
