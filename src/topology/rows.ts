// Flat rows for tables (CSV, NDJSON): one per frame and one per domain, with units in names.
import type { FrameResult } from "./analyze";

export type Cell = number | string;

function unitSuffix(unit: string): string {
  return unit.replace(/[^A-Za-z0-9µ]+/g, "");
}

/** The per-frame columns of a result, in table order. */
export function frameRow(r: FrameResult): Array<[string, Cell]> {
  const u = unitSuffix(r.options.unit);
  const row: Array<[string, Cell]> = [
    ["threshold", r.threshold.level],
    ["magnetization", r.magnetization],
    [`wall_length_${u}`, r.wallLength],
    [`wall_length_density_per_${u}`, r.wallLengthDensity],
  ];
  for (const [name, p] of [["up", r.up], ["down", r.down]] as const) {
    row.push(
      [`${name}_domains`, p.domains],
      [`${name}_area_fraction`, p.areaFraction],
      [`${name}_euler`, p.euler],
      [`${name}_holes`, p.holes],
      [`${name}_euler_density_per_${u}2`, p.eulerDensity],
      [`${name}_wrapping`, p.wrapping],
      [`${name}_edge`, p.edge],
      [`${name}_absorbed`, p.absorbed],
    );
  }
  const sp = r.spectrum;
  if (sp) {
    const v = (x: number | undefined): Cell => (x === undefined || !Number.isFinite(x) ? "" : x);
    row.push(
      [`period_${u}`, v(sp.period)],
      [`corr_length_${u}`, v(sp.corrLength)],
      ["corr_length_resolved", sp.corrLengthResolved ? 1 : 0],
      ["order2", v(sp.order2)],
      ["order2_angle_deg", v(sp.order2AngleDeg)],
      ["order6", v(sp.order6)],
      ["order6_angle_deg", v(sp.order6AngleDeg)],
      ["structure_order2", v(sp.structure?.order2)],
      [`period_from_walls_${u}`, r.wallLengthDensity > 0 ? 2 / r.wallLengthDensity : ""],
      ["spectrum_note", sp.reason ?? ""],
    );
  }
  return row;
}

/** Header of the per-domain table for lengths in `unit`. */
export function domainHeader(unit: string): string[] {
  const u = unitSuffix(unit);
  return [
    "id", "phase", `area_${u}2`, `wall_length_${u}`, "euler", "holes",
    `centroid_x_${u}`, `centroid_y_${u}`, `bbox_x_${u}`, `bbox_y_${u}`, `bbox_width_${u}`,
    `bbox_height_${u}`, `equivalent_diameter_${u}`, "elongation", "orientation_deg",
    "wraps_x", "wraps_y", "edge",
  ];
}

/** The per-domain rows of a result (same order as `domainHeader`). */
export function domainRows(r: FrameResult): Cell[][] {
  const t = r.domains;
  const rows: Cell[][] = [];
  for (let i = 0; i < t.count; i++) {
    rows.push([
      i + 1, t.phase[i] === 1 ? "up" : "down", t.area[i]!, t.wallLength[i]!, t.euler[i]!,
      Number.isNaN(t.holes[i]) ? "" : t.holes[i]!, t.centroidX[i]!, t.centroidY[i]!,
      t.bboxX[i]!, t.bboxY[i]!, t.bboxWidth[i]!, t.bboxHeight[i]!, t.equivalentDiameter[i]!,
      Number.isNaN(t.elongation[i]) ? "" : t.elongation[i]!,
      Number.isNaN(t.orientation[i]) ? "" : t.orientation[i]!,
      t.wrapsX[i]!, t.wrapsY[i]!, t.edge[i]!,
    ]);
  }
  return rows;
}

/** A CSV cell: numbers with up to 10 significant digits, strings quoted when needed. */
export function csvCell(v: Cell): string {
  if (typeof v === "number") {
    if (Number.isInteger(v)) return String(v);
    return Number.isFinite(v) ? String(Number(v.toPrecision(10))) : "";
  }
  return /[",\n\r]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v;
}

export function csvLine(cells: Cell[]): string {
  return cells.map(csvCell).join(",") + "\n";
}
