// Flat tables of sweep results for files: loop metrics as (quantity, value, reason) rows, the FORC
// grid in long format, excursions per reversal curve. Shared by `domtopo loop`, `forc` and `demo`.
import type { LoopMetrics } from "../sweep/loop";
import type { ForcDistribution } from "../sweep/forc";
import type { Excursion } from "../sweep/excursions";
import type { Outcome } from "../sweep/outcome";
import { csvLine, type Cell } from "../topology/rows";

export interface MetricRow {
  quantity: string;
  /** `null` when it could not be computed (see `reason`). */
  value: number | null;
  /** What the number is in: the field unit, the loop column, their product, or `1`. */
  unit: string;
  reason: string;
}

/** The field unit from a column name like `field_mT` (empty when there is none). */
export function fieldUnitOf(column: string): string {
  const m = /^(?:field|H|applied_field)_(.+)$/i.exec(column);
  return m ? m[1]! : "";
}

function row(quantity: string, o: Outcome<number>, unit: string): MetricRow {
  return { quantity, value: o.value ?? null, unit, reason: o.reason ?? "" };
}

/** Loop metrics in table order, each with its unit and, when missing, the reason. */
export function loopMetricRows(m: LoopMetrics, fieldUnit = "field", column = "magnetization"): MetricRow[] {
  const f = fieldUnit || "field";
  const q = column;
  return [
    row("coercive_field", m.coerciveField, f),
    row("loop_shift", m.loopShift, f),
    row("coercive_field_descending", m.descending.coerciveField, f),
    row("coercive_field_ascending", m.ascending.coerciveField, f),
    row("remanence", m.remanence, q),
    row("remanence_descending", m.descending.remanence, q),
    row("remanence_ascending", m.ascending.remanence, q),
    row("saturation", m.saturation, q),
    row("squareness", m.squareness, "1"),
    row("loop_area", m.loopArea, `${f}*${q}`),
    row("nucleation_field_descending", m.descending.nucleationField, f),
    row("saturation_field_descending", m.descending.saturationField, f),
    row("nucleation_field_ascending", m.ascending.nucleationField, f),
    row("saturation_field_ascending", m.ascending.saturationField, f),
  ];
}

export function metricRowsCsv(rows: MetricRow[]): string {
  return csvLine(["quantity", "value", "unit", "reason"]) +
    rows.map((r) => csvLine([r.quantity, r.value ?? "", r.unit, r.reason])).join("");
}

/** Loop metrics as a readable JSON object (no per-point arrays). */
export function loopMetricsJson(m: LoopMetrics, fieldUnit: string, column = "magnetization") {
  return {
    fieldUnit,
    metrics: Object.fromEntries(loopMetricRows(m, fieldUnit, column).map((r) => [r.quantity, r.value === null ? { value: null, reason: r.reason } : r.value])),
    branches: {
      ...m.branches,
      descending: { frames: m.descending.frames, fieldRange: m.descending.fieldRange, zeroCrossings: m.descending.zeroCrossings },
      ascending: { frames: m.ascending.frames, fieldRange: m.ascending.fieldRange, zeroCrossings: m.ascending.zeroCrossings },
    },
    saturationEstimate: m.saturation.method,
    options: m.options,
  };
}

/** Printed form: one aligned line per quantity. */
export function metricRowsText(rows: MetricRow[]): string {
  const w = Math.max(...rows.map((r) => r.quantity.length));
  return rows.map((r) => `  ${r.quantity.padEnd(w)}  ${r.value === null ? `-  (${r.reason})` : `${fmt(r.value)} ${r.unit === "1" ? "" : r.unit}`.trimEnd()}`).join("\n") + "\n";
}

export function fmt(x: number): string {
  return String(Number(x.toPrecision(6)));
}

/** The largest rho on the grid and where it is. */
export function forcPeak(f: ForcDistribution): { rho: number; reversalField: number; field: number } | null {
  let best: { rho: number; reversalField: number; field: number } | null = null;
  const nb = f.fields.length;
  f.rho.forEach((v, k) => {
    if (v !== null && (best === null || v > best.rho)) {
      best = { rho: v, reversalField: f.reversalFields[Math.floor(k / nb)]!, field: f.fields[k % nb]! };
    }
  });
  return best;
}

/** The FORC grid in long format: one row per (Ha, Hb) point. */
export function forcCsv(f: ForcDistribution, fieldUnit: string): string {
  const u = fieldUnit ? `_${fieldUnit}` : "";
  let out = csvLine([`reversal_field${u}`, `field${u}`, `coercivity${u}`, `interaction${u}`, "magnetization", "rho", "status"]);
  const nb = f.fields.length;
  for (let i = 0; i < f.reversalFields.length; i++) {
    const ha = f.reversalFields[i]!;
    for (let j = 0; j < nb; j++) {
      const hb = f.fields[j]!;
      const k = i * nb + j;
      const cells: Cell[] = [ha, hb, (hb - ha) / 2, (ha + hb) / 2, f.magnetization[k] ?? "", f.rho[k] ?? "", f.status[k]!];
      out += csvLine(cells);
    }
  }
  return out;
}

/** The FORC result as JSON (grids row-major, `null` where there is no value). */
export function forcJson(f: ForcDistribution, fieldUnit: string, extra: Record<string, unknown> = {}) {
  return {
    ...extra,
    fieldUnit,
    method: "local second-order fit, rho = -a6/2 (Pike, Roberts & Verosub 1999)",
    options: f.options,
    counts: f.counts,
    peak: forcPeak(f),
    reversalFields: f.reversalFields,
    fields: f.fields,
    rho: f.rho,
    magnetization: f.magnetization,
    coercivityInteraction: f.coercivityInteraction,
  };
}

/** Excursions of reversal curves from the major loop, one row per curve. */
export function excursionsCsv(reversalFields: number[], ex: Excursion[], fieldUnit: string): string {
  const u = fieldUnit ? `_${fieldUnit}` : "";
  let out = csvLine(["curve", `reversal_field${u}`, `leave_field${u}`, `rejoin_field${u}`, "max_deviation", `max_deviation_field${u}`, `area${u}`, `absolute_area${u}`, "reason"]);
  ex.forEach((e, k) => {
    const reason = e.leaveField.reason ?? e.rejoinField.reason ?? "";
    out += csvLine([
      k + 1, reversalFields[k]!, e.leaveField.value ?? "", e.rejoinField.value ?? "",
      e.maxDeviation.value?.deviation ?? "", e.maxDeviation.value?.field ?? "",
      e.area.value ?? "", e.absoluteArea.value ?? "", reason,
    ]);
  });
  return out;
}
