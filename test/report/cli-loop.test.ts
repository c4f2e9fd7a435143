import { describe, expect, it, beforeAll } from "vitest";
import { existsSync, mkdtempSync, readFileSync, readdirSync, writeFileSync, mkdirSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { tanhLoop, hysteronEnsemble, hysteronReversalCurves, hysteronSweep } from "../../src/sweep/synthetic";
import { run } from "./helpers";

let dir = "";
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "domtopo-loop-"));
});

function writeTable(name: string, header: string[], rows: Array<Array<number | string>>): string {
  const file = join(dir, name);
  writeFileSync(file, [header.join(","), ...rows.map((r) => r.join(","))].join("\n") + "\n");
  return file;
}

const ms = 1.5, hc = 1.013, w = 0.4;
const tanh = tanhLoop({ saturation: ms, coerciveField: hc, width: w, fieldMax: 6, fieldStep: 0.02 });

describe("domtopo loop", () => {
  it("gives the loop area 4 Ms Hc of a tanh loop written as a per-frame table", () => {
    const file = writeTable("tanh.csv", ["frame", "field_mT", "magnetization"], tanh.field.map((h, k) => [k, h, tanh.magnetization[k]!]));
    const out = join(dir, "tanh-out");
    const r = run(["loop", file, "--field-column", "field_mT", "--out", out]);
    expect(r.err).toBe("");
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/coercive_field\s+1\.01/);
    const json = JSON.parse(readFileSync(join(out, "loop-metrics.json"), "utf8"));
    // CHECKS.md "Loops and FORC": loop area 4 Ms Hc for a field range wide against w (+-6 = 12.5 w
    // beyond Hc here). Tolerance 1e-3 relative: trapezoid rule on 401 points plus 10-digit cells.
    expect(json.metrics.loop_area).toBeCloseTo(4 * ms * hc, 2);
    expect(Math.abs(json.metrics.loop_area / (4 * ms * hc) - 1)).toBeLessThan(1e-3);
    // CHECKS.md: coercive fields +-Hc and remanence Ms tanh(Hc/w).
    expect(json.metrics.coercive_field).toBeCloseTo(hc, 3);
    expect(json.metrics.remanence).toBeCloseTo(ms * Math.tanh(hc / w), 6);
    expect(json.metrics.saturation).toBeCloseTo(ms, 3);
    const csv = readFileSync(join(out, "loop-metrics.csv"), "utf8");
    expect(csv.split("\n")[0]).toBe("quantity,value,unit,reason");
    expect(csv).toMatch(/^squareness,/m);
  });

  it("reads another column than magnetization with --column", () => {
    const file = writeTable("tanh-m.csv", ["H_mT", "m_kerr"], tanh.field.map((h, k) => [h, tanh.magnetization[k]!]));
    const r = run(["loop", file, "--field-column", "H_mT", "--column", "m_kerr"]);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/m_kerr against H_mT/);
  });
});

describe("domtopo forc", () => {
  // CHECKS.md "Loops and FORC": an ensemble of square hysterons has rho = (Ms/2) p_c p_u, here
  // peaked at Hc = 0.5, Hu = 0, i.e. Ha = -0.5, Hb = 0.5.
  const model = hysteronEnsemble({ coercivityMean: 0.5, coercivitySpread: 0.1, interactionSpread: 0.1 });
  const curves = hysteronReversalCurves(model, { firstReversal: -1, lastReversal: 0, fieldStep: 0.04, fieldMax: 1 });
  const rows: Array<Array<number | string>> = [];
  curves.forEach((c) => c.field.forEach((hb, j) => rows.push([rows.length, Number(c.reversalField.toFixed(6)), Number(hb.toFixed(6)), c.values[j]!])));

  it("writes the rho grid as CSV and JSON from a reversal-field column, peaked where the hysterons are", () => {
    const file = writeTable("forc.csv", ["frame", "reversal_field_mT", "field_mT", "magnetization"], rows);
    const out = join(dir, "forc-out");
    const r = run(["forc", file, "--field-column", "field_mT", "--reversal-column", "reversal_field_mT", "--sf", "2", "--out", out]);
    expect(r.code).toBe(0);
    expect(r.err).toMatch(/26 reversal curves, SF = 2/);
    const json = JSON.parse(readFileSync(join(out, "forc.json"), "utf8"));
    expect(json.peak.rho).toBeGreaterThan(0);
    expect(json.peak.reversalField).toBeCloseTo(-0.5, 1);
    expect(json.peak.field).toBeCloseTo(0.5, 1);
    const csv = readFileSync(join(out, "forc.csv"), "utf8").trim().split("\n");
    expect(csv[0]).toBe("reversal_field_mT,field_mT,coercivity_mT,interaction_mT,magnetization,rho,status");
    expect(csv).toHaveLength(1 + json.reversalFields.length * json.fields.length);
  });

  it("finds the reversal points in a single sweep when no reversal column is given, with the same grid", () => {
    const sweep = hysteronSweep(model, { firstReversal: -1, lastReversal: 0, fieldStep: 0.04, fieldMax: 1 });
    const file = writeTable("forc-sweep.csv", ["field_mT", "magnetization"], sweep.field.map((h, k) => [Number(h.toFixed(6)), sweep.magnetization[k]!]));
    const r = run(["forc", file, "--field-column", "field_mT", "--sf", "2", "--quiet"]);
    expect(r.code).toBe(0);
    const lines = r.out.trim().split("\n");
    const withRho = lines.slice(1).filter((l) => l.endsWith(",ok"));
    expect(withRho.length).toBeGreaterThan(50);
    const explicit = JSON.parse(readFileSync(join(dir, "forc-out", "forc.json"), "utf8"));
    expect(withRho.length).toBe(explicit.counts.ok);
  });
});

describe("bad tables for loop and forc", () => {
  const good = () => tanh.field.map((h, k) => [k, h, tanh.magnetization[k]!] as Array<number | string>);

  it("names the file and the missing column, and exits with 1", () => {
    const file = writeTable("no-field.csv", ["frame", "field_mT", "magnetization"], good());
    const r = run(["loop", file, "--field-column", "field_T"]);
    expect(r.code).toBe(1);
    expect(r.err).toContain(file);
    expect(r.err).toContain('no column "field_T"');
  });

  it("names the file, column and row of a non-numeric cell", () => {
    const rows = good();
    rows[2]![2] = "abc";
    const file = writeTable("text-cell.csv", ["frame", "field_mT", "magnetization"], rows);
    const r = run(["loop", file, "--field-column", "field_mT"]);
    expect(r.code).toBe(1);
    expect(r.err).toContain(`${file}: column "magnetization", row 3 (line 4): expected a finite number, got "abc"`);
  });

  it("names the row of a NaN field and of an empty cell", () => {
    const rows = good();
    rows[5]![1] = "NaN";
    const nan = run(["loop", writeTable("nan.csv", ["frame", "field_mT", "magnetization"], rows), "--field-column", "field_mT"]);
    expect(nan.code).toBe(1);
    expect(nan.err).toMatch(/column "field_mT", row 6 \(line 7\): expected a finite number, got "NaN"/);
    const rows2 = good();
    rows2[7]![2] = "";
    const empty = run(["loop", writeTable("empty.csv", ["frame", "field_mT", "magnetization"], rows2), "--field-column", "field_mT"]);
    expect(empty.code).toBe(1);
    expect(empty.err).toMatch(/column "magnetization", row 8 \(line 9\): expected a number, got an empty cell/);
  });

  it("rejects a sweep whose branches are too short for a loop, naming the rows", () => {
    const file = writeTable("short.csv", ["field_mT", "magnetization"], [[1, 1], [0, 0.5], [-1, -1], [0, -0.5]]);
    const r = run(["loop", file, "--field-column", "field_mT"]);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/short\.csv: column "field_mT": the longest ascending branch, row 3 \(line 4\) to row 4 \(line 5\), has 2 frames/);
  });

  it("rejects a reversal curve of one frame, naming the column and row, and writes nothing", () => {
    const rows: Array<Array<number | string>> = [[-1, -1, -0.9], [-1, 0, -0.2], [-1, 1, 1], [0, 0, 0.5]];
    const file = writeTable("one-frame-curve.csv", ["reversal_field", "field", "magnetization"], rows);
    const out = join(dir, "never");
    const r = run(["forc", file, "--field-column", "field", "--reversal-column", "reversal_field", "--out", out]);
    expect(r.code).toBe(1);
    expect(r.err).toContain(`${file}: column "reversal_field": the curve at Ha = 0 (row 4 (line 5) to row 4 (line 5)) has 1 frame`);
    expect(existsSync(out)).toBe(false);
  });

  it("says which curves are too short for SF, and leaves an earlier result untouched", () => {
    const out = join(dir, "kept");
    mkdirSync(out, { recursive: true });
    writeFileSync(join(out, "forc.csv"), "earlier\n");
    const rows: Array<Array<number | string>> = [];
    for (const ha of [-1, -0.5]) for (const hb of [ha, ha + 0.5, 1]) rows.push([ha, hb, hb / 2]);
    const file = writeTable("few-curves.csv", ["reversal_field", "field", "magnetization"], rows);
    const r = run(["forc", file, "--field-column", "field", "--reversal-column", "reversal_field", "--sf", "3", "--out", out]);
    expect(r.code).toBe(1);
    expect(r.err).toContain(file);
    expect(r.err).toMatch(/needs 7 curves .* got 2 curves/);
    expect(readFileSync(join(out, "forc.csv"), "utf8")).toBe("earlier\n");
    expect(readdirSync(out)).toEqual(["forc.csv"]);
  });

  it("treats a missing --field-column as a usage error (exit code 2)", () => {
    const r = run(["loop", join(dir, "tanh.csv")]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/expected --field-column NAME/);
  });
});
