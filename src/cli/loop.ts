// `domtopo loop` and `domtopo forc`: loop metrics and the FORC distribution of a per-frame table.
import { join, resolve } from "node:path";
import { loopMetrics, type LoopMetrics } from "../sweep/loop";
import { forcDistribution, forcFromSweep, type ForcDistribution } from "../sweep/forc";
import type { ReversalCurve } from "../sweep/reversal-curves";
import { AtomicWriter } from "../node/atomic";
import { readCsv, numericColumn, rowPlace, type CsvTable } from "./csv-table";
import {
  fieldUnitOf, forcCsv, forcJson, forcPeak, fmt, loopMetricRows, loopMetricsJson, metricRowsCsv, metricRowsText,
} from "./loop-tables";
import { UsageError, numberFlag, parseCommand } from "./usage";
import { VERSION } from "../version";

export const LOOP_HELP = `Usage: domtopo loop <frames.csv> --field-column NAME [options]

Loop metrics of a sweep in a per-frame table: coercive fields and loop shift, remanence on each
branch, saturation Ms, squareness Mr/Ms, loop area, nucleation and saturation fields. The sweep is
split into ascending and descending branches; the widest of each direction is used.

Options:
  --field-column NAME   column of the applied field (e.g. field_mT)
  --column NAME         column of the loop quantity [magnetization]
  --out DIR             also write DIR/loop-metrics.json and DIR/loop-metrics.csv
  --quiet               print nothing (with --out)
  -h, --help            this help

A quantity the sweep does not allow (e.g. no saturation reached) is printed with the reason.
Bad input (missing column, empty, NaN or non-numeric cells, a branch of fewer than 3 frames)
fails with exit code 1, naming the file, column and row; nothing is written then.`;

export const FORC_HELP = `Usage: domtopo forc <frames.csv> --field-column NAME [options]

FORC distribution rho(Ha, Hb) = -(1/2) d2M/dHa dHb by a local second-order fit over
(2 SF + 1)^2 grid points (Pike, Roberts & Verosub 1999).

Options:
  --field-column NAME     column of the applied field Hb
  --reversal-column NAME  column of the reversal field Ha of each frame's curve (frames with an
                          empty cell are on no curve); without it, reversal points are found in
                          the field sweep itself (each ascending branch after a descending one)
  --column NAME           column of M [magnetization]
  --sf N                  smoothing factor SF [3]
  --field-step S          Hb step of the grid [median spacing of the reversal fields]
  --out DIR               write DIR/forc.csv and DIR/forc.json; without it the grid CSV goes to
                          standard output
  --quiet                 no summary on stderr
  -h, --help              this help

Bad input (missing column, empty, NaN or non-numeric cells, a curve of fewer than 2 frames,
fields falling along a curve, curves too short for SF) fails with exit code 1, naming the file,
column and rows; nothing is written then.`;

function requireColumn(values: Record<string, unknown>, flag: string, command: string): string {
  const v = values[flag];
  if (typeof v !== "string" || v === "") throw new UsageError(`${command}: expected --${flag} NAME (see domtopo ${command} --help)`);
  return v;
}

function oneInput(positionals: string[], command: string): string {
  if (positionals.length !== 1) {
    throw new UsageError(`${command}: expected one frames.csv, got ${positionals.length} arguments (see domtopo ${command} --help)`);
  }
  return positionals[0]!;
}

/** Loop metrics of a table's columns, rejecting sweeps that give no loop at all. */
export function tableLoopMetrics(t: CsvTable, fieldColumn: string, column: string): LoopMetrics {
  const field = numericColumn(t, fieldColumn);
  const m = numericColumn(t, column);
  if (t.rows.length < 3) {
    throw new Error(`${t.file}: column "${fieldColumn}": expected a sweep of at least 3 frames, got ${t.rows.length}`);
  }
  const r = loopMetrics(field, m);
  for (const dir of ["descending", "ascending"] as const) {
    const b = r[dir];
    if (b.frames === null) {
      throw new Error(`${t.file}: column "${fieldColumn}": the sweep has no ${dir} branch (field from ${field[0]} to ${field[field.length - 1]})`);
    }
    const count = b.frames[1] - b.frames[0] + 1;
    if (count < 3) {
      throw new Error(
        `${t.file}: column "${fieldColumn}": the longest ${dir} branch, ${rowPlace(t, b.frames[0])} to ${rowPlace(t, b.frames[1])}, ` +
          `has ${count} frames; a loop needs at least 3 on each branch`,
      );
    }
  }
  return r;
}

export async function runLoop(argv: string[]): Promise<number> {
  const { values, positionals } = parseCommand("loop", argv, {
    "field-column": { type: "string" }, column: { type: "string" }, out: { type: "string" },
    quiet: { type: "boolean" }, help: { type: "boolean", short: "h" },
  });
  if (values.help) { process.stdout.write(LOOP_HELP + "\n"); return 0; }
  const file = oneInput(positionals, "loop");
  const fieldColumn = requireColumn(values, "field-column", "loop");
  const column = (values.column as string | undefined) ?? "magnetization";
  const t = readCsv(file);
  const metrics = tableLoopMetrics(t, fieldColumn, column);
  const unit = fieldUnitOf(fieldColumn);
  const rows = loopMetricRows(metrics, unit, column);
  if (values.out !== undefined) {
    const dir = resolve(values.out as string);
    const json = { tool: "domtopo", version: VERSION, command: "loop", input: file, fieldColumn, column, ...loopMetricsJson(metrics, unit, column) };
    commitAll([
      [join(dir, "loop-metrics.json"), JSON.stringify(json, null, 2) + "\n"],
      [join(dir, "loop-metrics.csv"), metricRowsCsv(rows)],
    ]);
  }
  if (!values.quiet || values.out === undefined) {
    process.stdout.write(`Loop metrics of ${file} (${column} against ${fieldColumn}, ${t.rows.length} frames):\n` + metricRowsText(rows));
    if (values.out !== undefined) process.stdout.write(`Wrote ${join(resolve(values.out as string), "loop-metrics.json")} and loop-metrics.csv\n`);
  }
  return 0;
}

/** Reversal curves from a column of Ha per frame (frames with an empty cell belong to none). */
export function curvesFromReversalColumn(t: CsvTable, fieldColumn: string, reversalColumn: string, column: string): ReversalCurve[] {
  const field = numericColumn(t, fieldColumn);
  const ha = numericColumn(t, reversalColumn, { empty: "null" });
  const m = numericColumn(t, column);
  const byHa = new Map<number, number[]>();
  ha.forEach((h, r) => {
    if (h === null) return;
    const list = byHa.get(h);
    if (list) list.push(r); else byHa.set(h, [r]);
  });
  if (byHa.size === 0) throw new Error(`${t.file}: column "${reversalColumn}": no row has a reversal field (every cell is empty)`);
  const curves: ReversalCurve[] = [];
  for (const [h, rows] of byHa) {
    const first = rows[0]!, last = rows[rows.length - 1]!;
    const where = `the curve at Ha = ${h} (${rowPlace(t, first)} to ${rowPlace(t, last)})`;
    if (rows.length < 2) {
      throw new Error(`${t.file}: column "${reversalColumn}": ${where} has ${rows.length} frame; a reversal curve needs at least 2`);
    }
    for (let k = 1; k < rows.length; k++) {
      if (field[rows[k]!]! < field[rows[k - 1]!]!) {
        throw new Error(
          `${t.file}: column "${fieldColumn}", ${rowPlace(t, rows[k]!)}: expected the field to rise along ${where}, ` +
            `got ${field[rows[k]!]} after ${field[rows[k - 1]!]}`,
        );
      }
    }
    if (field[first]! < h - 1e-9 * Math.max(1, Math.abs(h))) {
      throw new Error(`${t.file}: column "${fieldColumn}", ${rowPlace(t, first)}: expected Hb >= Ha = ${h} on ${where}, got ${field[first]}`);
    }
    curves.push({ reversalField: h, field: rows.map((r) => field[r]!), values: rows.map((r) => m[r]!), frames: [first, last] });
  }
  return curves;
}

export async function runForc(argv: string[]): Promise<number> {
  const { values, positionals } = parseCommand("forc", argv, {
    "field-column": { type: "string" }, "reversal-column": { type: "string" }, column: { type: "string" },
    sf: { type: "string" }, "field-step": { type: "string" }, out: { type: "string" },
    quiet: { type: "boolean" }, help: { type: "boolean", short: "h" },
  });
  if (values.help) { process.stdout.write(FORC_HELP + "\n"); return 0; }
  const file = oneInput(positionals, "forc");
  const fieldColumn = requireColumn(values, "field-column", "forc");
  const reversalColumn = values["reversal-column"] as string | undefined;
  const column = (values.column as string | undefined) ?? "magnetization";
  const sf = numberFlag("sf", values.sf) ?? 3;
  if (!Number.isInteger(sf) || sf < 1) throw new UsageError(`--sf: expected an integer >= 1, got ${values.sf}`);
  const fieldStep = numberFlag("field-step", values["field-step"]);
  if (fieldStep !== undefined && !(fieldStep > 0)) throw new UsageError(`--field-step: expected a number > 0, got ${values["field-step"]}`);
  const t = readCsv(file);
  const options = { smoothingFactor: sf, ...(fieldStep !== undefined ? { fieldStep } : {}) };
  let forc: ForcDistribution;
  let curves: number;
  try {
    if (reversalColumn !== undefined) {
      const list = curvesFromReversalColumn(t, fieldColumn, reversalColumn, column);
      forc = forcDistribution(list, options);
      curves = list.length;
    } else {
      const field = numericColumn(t, fieldColumn);
      const m = numericColumn(t, column);
      const r = forcFromSweep(field, m, options);
      forc = r;
      curves = r.curves;
    }
  } catch (err) {
    const msg = (err as Error).message;
    if (msg.startsWith(t.file)) throw err;
    throw new Error(`${t.file}: columns "${fieldColumn}"${reversalColumn ? `, "${reversalColumn}"` : ""}, "${column}": ${msg}`);
  }
  const unit = fieldUnitOf(fieldColumn);
  const csv = forcCsv(forc, unit);
  if (values.out !== undefined) {
    const dir = resolve(values.out as string);
    const json = forcJson(forc, unit, {
      tool: "domtopo", version: VERSION, command: "forc", input: file, fieldColumn,
      reversalColumn: reversalColumn ?? null, column, curves,
    });
    commitAll([[join(dir, "forc.csv"), csv], [join(dir, "forc.json"), JSON.stringify(json) + "\n"]]);
  } else {
    process.stdout.write(csv);
  }
  if (!values.quiet) {
    const peak = forcPeak(forc);
    process.stderr.write(
      `FORC of ${file}: ${curves} reversal curves, SF = ${sf}, grid ${forc.reversalFields.length} x ${forc.fields.length} ` +
        `(step ${fmt(forc.options.fieldStep)}), rho at ${forc.counts.ok} points` +
        (peak ? `, peak ${fmt(peak.rho)} at Ha = ${fmt(peak.reversalField)}, Hb = ${fmt(peak.field)}` : "") + "\n",
    );
    if (values.out !== undefined) process.stderr.write(`Wrote ${join(resolve(values.out as string), "forc.csv")} and forc.json\n`);
  }
  return 0;
}

/** Writes several files so that either all appear or none changes. */
export function commitAll(files: Array<[string, string | Uint8Array]>): void {
  const writers: AtomicWriter[] = [];
  try {
    for (const [path, data] of files) {
      const w = new AtomicWriter(path);
      writers.push(w);
      w.write(data);
    }
  } catch (err) {
    for (const w of writers) w.abort();
    throw err;
  }
  for (const w of writers) w.commit();
}
