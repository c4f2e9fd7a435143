// Flat rows for tables (CSV, NDJSON): one per frame and one per domain, with units in names.
import type { FrameResult } from "./analyze";
import { KIND_NAMES } from "./classify";

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
  const sk = r.skeleton;
  if (sk) {
    const v = (x: number): Cell => (Number.isFinite(x) ? x : "");
    for (const [name, p] of [["up", sk.up], ["down", sk.down]] as const) {
      row.push(
        [`${name}_bubbles`, p.bubble.count],
        [`${name}_stripes`, p.stripe.count],
        [`${name}_closed_stripes`, p.stripe.closed],
        [`${name}_labyrinths`, p.labyrinth.count],
        [`${name}_bubble_area_fraction`, p.bubble.areaFraction],
        [`${name}_stripe_area_fraction`, p.stripe.areaFraction],
        [`${name}_labyrinth_area_fraction`, p.labyrinth.areaFraction],
        [`${name}_ends_per_${u}2`, p.endsDensity],
        [`${name}_junctions_per_${u}2`, p.junctionDensity],
        [`${name}_junctions3_per_${u}2`, p.junctions3Density],
        [`${name}_junctions4plus_per_${u}2`, p.junctions4plusDensity],
        [`${name}_bubble_diameter_mean_${u}`, v(p.bubbleDiameterMean)],
        [`${name}_bubble_diameter_std_${u}`, v(p.bubbleDiameterStd)],
        [`${name}_stripe_width_mean_${u}`, v(p.stripeWidthMean)],
        [`${name}_skeleton_length_density_per_${u}`, p.skeletonLengthDensity],
      );
    }
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

/** Header of the per-domain table for lengths in `unit` (with the skeleton columns when on). */
export function domainHeader(unit: string, skeleton = true): string[] {
  const u = unitSuffix(unit);
  const head = [
    "id", "phase", `area_${u}2`, `wall_length_${u}`, "euler", "holes",
    `centroid_x_${u}`, `centroid_y_${u}`, `bbox_x_${u}`, `bbox_y_${u}`, `bbox_width_${u}`,
    `bbox_height_${u}`, `equivalent_diameter_${u}`, "elongation", "orientation_deg",
    "wraps_x", "wraps_y", "edge",
  ];
  if (skeleton) {
    head.push("kind", `skeleton_length_${u}`, "ends", "junctions3", "junctions4plus", "branches",
      "loops", `mean_width_${u}`, "closed");
  }
  return head;
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
    const c = r.skeleton?.columns;
    if (c) {
      rows[i]!.push(KIND_NAMES[c.kind[i]!] ?? "", c.skeletonLength[i]!, c.ends[i]!, c.junctions3[i]!,
        c.junctions4plus[i]!, c.branches[i]!, c.loops[i]!,
        Number.isFinite(c.meanWidth[i]) ? c.meanWidth[i]! : "", c.closed[i]!);
    }
  }
  return rows;
}

/** A CSV cell: numbers with up to 10 significant digits, strings quoted when needed. */
export function csvCell(v: Cell): string {
  if (typeof v === "number") {
    if (Number.isInteger(v)) return String(v);
    if (!Number.isFinite(v)) return "";
    return fixedDigits(v) ?? slowDigits(v);
  }
  return plainText(v) ? v : `"${v.replace(/"/g, '""')}"`;
}

/** No quote, comma or line break in s. */
function plainText(s: string): boolean {
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i);
    if (c === 34 || c === 44 || c === 10 || c === 13) return false;
  }
  return true;
}

/** 10 significant digits, written as String(Number(v.toPrecision(10))) would write them. */
function slowDigits(v: number): string {
  // In fixed notation that is the digits without trailing zeros (no exponent form is shortened).
  const s = v.toPrecision(10);
  if (s.includes("e")) return String(Number(s));
  if (!s.includes(".")) return s; // ten digits before the point
  const t = trimZeros(s);
  return t.charCodeAt(t.length - 1) === 46 ? t.slice(0, -1) : t; // (a bare '.' goes too)
}

const POW10 = Float64Array.from({ length: 16 }, (_v, k) => 10 ** k);
const ZEROS = "0000000000";

/**
 * slowDigits without toPrecision where the answer is plain: 1e-6 <= |v| < 1e9 and the ten-digit
 * rounding far from a tie. From 1 up: the integer part as it is, the fraction (exact: |v| minus
 * its integer part) times 10^(10 - integer digits); below 1: |v| times 10^(10 + leading zeros).
 * Either product is off by a few 1e-6 at most, so a fraction within 1e-4 of one half, or a
 * rounding that carries into another digit, goes the slow way (undefined).
 */
function fixedDigits(v: number): string | undefined {
  const a = v < 0 ? -v : v;
  if (!(a >= 1e-6 && a < 1e9)) return undefined;
  let out: string;
  if (a >= 1) {
    const ip = Math.floor(a);
    const il = ip < 10 ? 1 : ip < 100 ? 2 : ip < 1e3 ? 3 : ip < 1e4 ? 4 : ip < 1e5 ? 5 : ip < 1e6 ? 6 : ip < 1e7 ? 7 : ip < 1e8 ? 8 : 9;
    const fd = 10 - il, scaled = (a - ip) * POW10[fd]!;
    const fl = Math.floor(scaled), fr = scaled - fl;
    if (fr > 0.4999 && fr < 0.5001) return undefined;
    const f = fr > 0.5 ? fl + 1 : fl;
    if (f >= POW10[fd]!) return undefined;
    out = f === 0 ? String(ip) : `${ip}.${trimZeros(padDigits(f, fd))}`;
  } else {
    let z = 0; // zeros after the point
    while (a < 0.1 / POW10[z]!) z++;
    const scaled = a * POW10[10 + z]!;
    const fl = Math.floor(scaled), fr = scaled - fl;
    if (fr > 0.4999 && fr < 0.5001) return undefined;
    const r = fr > 0.5 ? fl + 1 : fl;
    if (r >= 1e10 || r < 1e9) return undefined; // (a zero count off by one near a power of ten)
    // Ten digits as two halves of five (numbers below 2^31 print fastest).
    const hi = Math.floor(r / 1e5);
    out = `0.${ZEROS.slice(0, z)}${trimZeros(String(hi) + padDigits(r - hi * 1e5, 5))}`;
  }
  return v < 0 ? `-${out}` : out;
}

/** n (0 <= n < 10^width) with leading zeros to `width` digits. */
function padDigits(n: number, width: number): string {
  const s = String(n);
  return s.length < width ? ZEROS.slice(0, width - s.length) + s : s;
}

function trimZeros(s: string): string {
  let end = s.length;
  while (end > 0 && s.charCodeAt(end - 1) === 48) end--;
  return end === s.length ? s : s.slice(0, end);
}

export function csvLine(cells: Cell[]): string {
  let line = cells.length > 0 ? csvCell(cells[0]!) : "";
  for (let i = 1; i < cells.length; i++) line += `,${csvCell(cells[i]!)}`;
  return `${line}\n`;
}
