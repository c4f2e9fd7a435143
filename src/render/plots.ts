// Plot specifications (Vega-Lite v6 JSON) for quantities against field: the loop m(H) with its
// reversal curves, domain counts and Euler numbers on each branch, wall length density, and the
// FORC distribution as a heatmap. Browser-safe: plain data in, plain JSON out; the same spec can
// be rendered to SVG in Node (see ./svg.ts) or embedded in a page with vega-embed.

/** A Vega-Lite specification (plain JSON). */
export type PlotSpec = Record<string, unknown>;

/** Size of one plot panel in CSS pixels. */
export interface PlotSize {
  /** @default 440 */
  width?: number;
  /** @default 300 */
  height?: number;
}

/** One curve against field, drawn in sweep order (not sorted by field). */
export interface FieldSeries {
  /** Legend entry (e.g. "descending", "up domains"). */
  name: string;
  /** Grouping drawn with a dash pattern (e.g. the branch); optional. */
  group?: string;
  field: ArrayLike<number>;
  values: ArrayLike<number>;
}

const SCHEMA = "https://vega.github.io/schema/vega-lite/v6.json";

/** Shared look: quiet grid, no frame around the view, one font. */
export const PLOT_CONFIG = {
  font: "Helvetica, Arial, sans-serif",
  view: { stroke: null },
  axis: { gridColor: "#e4e7ec", domainColor: "#667085", tickColor: "#667085", labelColor: "#344054", titleColor: "#101828", titleFontWeight: 600 },
  legend: { labelColor: "#344054", titleColor: "#101828", orient: "top" },
  title: { anchor: "start", fontSize: 14, fontWeight: 600, color: "#101828" },
} as const;

/** Colours of the two major branches (our own pair: slate blue down the loop, amber up it). */
export const BRANCH_COLORS = { descending: "#3b5b92", ascending: "#c8741a" } as const;
/** Colours of the two phases in topology plots. */
export const PHASE_COLORS = { up: "#b42318", down: "#175cd3" } as const;

function fieldTitle(fieldUnit: string): string {
  return fieldUnit ? `applied field H (${fieldUnit})` : "frame";
}

/** Long-format rows of several series; `order` keeps each series in sweep order. */
function seriesRows(series: FieldSeries[]): Array<Record<string, number | string>> {
  const rows: Array<Record<string, number | string>> = [];
  for (const s of series) {
    const n = Math.min(s.field.length, s.values.length);
    for (let k = 0; k < n; k++) {
      const h = s.field[k]!, v = s.values[k]!;
      if (!Number.isFinite(h) || !Number.isFinite(v)) continue;
      rows.push({ field: h, value: v, series: s.name, group: s.group ?? "", order: k });
    }
  }
  return rows;
}

/** Options of {@link loopPlotSpec}. */
export interface LoopPlotInput extends PlotSize {
  fieldUnit: string;
  /** The major loop's branches (usually one descending and one ascending). */
  major: Array<{ direction: "descending" | "ascending"; field: ArrayLike<number>; magnetization: ArrayLike<number> }>;
  /** Reversal curves, each starting at its reversal field Ha. */
  reversalCurves?: Array<{ reversalField: number; field: ArrayLike<number>; magnetization: ArrayLike<number> }>;
  /** Name of the plotted quantity. @default "magnetization m" */
  quantity?: string;
  title?: string;
}

/** The loop m(H): both major branches in colour, reversal curves as thin grey lines under them. */
export function loopPlotSpec(input: LoopPlotInput): PlotSpec {
  const width = input.width ?? 440, height = input.height ?? 300;
  const major = seriesRows(input.major.map((b) => ({ name: `major ${b.direction}`, field: b.field, values: b.magnetization })));
  const curves = seriesRows((input.reversalCurves ?? []).map((c) => ({
    name: `Ha = ${fmt(c.reversalField)}`, field: c.field, values: c.magnetization,
  })));
  const x = { field: "field", type: "quantitative", title: fieldTitle(input.fieldUnit) };
  const y = { field: "value", type: "quantitative", title: input.quantity ?? "magnetization m" };
  const layers: PlotSpec[] = [];
  if (curves.length > 0) {
    layers.push({
      data: { values: curves },
      mark: { type: "line", strokeWidth: 1, color: "#98a2b3", clip: true },
      encoding: { x, y, detail: { field: "series" }, order: { field: "order" } },
      name: "reversal-curves",
    });
  }
  layers.push({
    data: { values: major },
    mark: { type: "line", strokeWidth: 2.2, clip: true },
    encoding: {
      x, y, order: { field: "order" },
      color: {
        field: "series", type: "nominal", title: null,
        scale: { domain: ["major descending", "major ascending"], range: [BRANCH_COLORS.descending, BRANCH_COLORS.ascending] },
      },
    },
    name: "major-loop",
  });
  return {
    $schema: SCHEMA,
    title: input.title ?? (curves.length ? `Loop and ${input.reversalCurves!.length} reversal curves` : "Loop"),
    width, height, config: PLOT_CONFIG, layer: layers,
  };
}

/** Options of {@link fieldSeriesSpec}. */
export interface FieldSeriesInput extends PlotSize {
  fieldUnit: string;
  series: FieldSeries[];
  yTitle: string;
  title?: string;
  /** Colours by series name; others get the default scheme. */
  colors?: Record<string, string>;
  /** Legend title of the dash groups. @default "branch" */
  groupTitle?: string;
}

/** Quantities against field: one colour per series, one dash pattern per group (branch). */
export function fieldSeriesSpec(input: FieldSeriesInput): PlotSpec {
  const width = input.width ?? 440, height = input.height ?? 260;
  const rows = seriesRows(input.series);
  const names = [...new Set(input.series.map((s) => s.name))];
  const groups = [...new Set(input.series.map((s) => s.group ?? ""))];
  const color: PlotSpec = { field: "series", type: "nominal", title: null };
  if (input.colors && names.every((n) => input.colors![n])) {
    color.scale = { domain: names, range: names.map((n) => input.colors![n]) };
  }
  const encoding: PlotSpec = {
    x: { field: "field", type: "quantitative", title: fieldTitle(input.fieldUnit) },
    y: { field: "value", type: "quantitative", title: input.yTitle },
    color, order: { field: "order" }, detail: { field: "group" },
  };
  // Dashes only when they say something the colours do not (groups other than the series).
  const sameAsSeries = groups.length === names.length && input.series.every((x) => (x.group ?? "") === x.name);
  if (groups.length > 1 && !sameAsSeries) {
    encoding.strokeDash = { field: "group", type: "nominal", title: input.groupTitle ?? "branch", scale: { domain: groups, range: groups.map((_, k) => (k === 0 ? [1, 0] : [5, 3])) } };
  }
  return {
    $schema: SCHEMA, title: input.title ?? input.yTitle, width, height, config: PLOT_CONFIG,
    data: { values: rows },
    mark: { type: "line", strokeWidth: 1.8, point: rows.length <= 120 ? { size: 14 } : false },
    encoding,
  };
}

/** A branch with per-frame topology columns, for {@link branchTopologySpec}. */
export interface TopologyBranch {
  /** e.g. "descending", "ascending" (drawn as the dash pattern). */
  label: string;
  field: ArrayLike<number>;
  upDomains: ArrayLike<number>;
  downDomains: ArrayLike<number>;
  upEuler: ArrayLike<number>;
  downEuler: ArrayLike<number>;
}

/** Up/down domain counts and Euler numbers against field on each branch: two stacked panels. */
export function branchTopologySpec(input: { fieldUnit: string; branches: TopologyBranch[]; title?: string } & PlotSize): PlotSpec {
  const panel = (yTitle: string, pick: (b: TopologyBranch) => [ArrayLike<number>, ArrayLike<number>]) => {
    const series: FieldSeries[] = [];
    for (const b of input.branches) {
      const [up, down] = pick(b);
      series.push({ name: "up", group: b.label, field: b.field, values: up });
      series.push({ name: "down", group: b.label, field: b.field, values: down });
    }
    const s = fieldSeriesSpec({ fieldUnit: input.fieldUnit, series, yTitle, colors: PHASE_COLORS, width: input.width, height: input.height ?? 180 });
    delete s.$schema; delete s.config;
    s.title = yTitle;
    return s;
  };
  return {
    $schema: SCHEMA, config: PLOT_CONFIG,
    title: input.title ?? "Topology against field",
    vconcat: [
      panel("domains of each phase", (b) => [b.upDomains, b.downDomains]),
      panel("Euler number of each phase", (b) => [b.upEuler, b.downEuler]),
    ],
    resolve: { scale: { color: "shared", strokeDash: "shared" } },
  };
}

/** Input of {@link forcHeatmapSpec}: a FORC grid, row-major `rho[i * fields.length + j]`. */
export interface ForcHeatmapInput extends PlotSize {
  fieldUnit: string;
  /** Ha of each row (ascending). */
  reversalFields: number[];
  /** Hb of each column (evenly spaced). */
  fields: number[];
  rho: ArrayLike<number | null>;
  smoothingFactor?: number;
  title?: string;
  /** Legend title of the colour. @default "rho" */
  quantity?: string;
  /**
   * `"diverging"`: a scale centred on 0 (for rho); `"sequential"`: from the lowest to the highest
   * value (for counts). @default "diverging"
   */
  colorScale?: "diverging" | "sequential";
}

/**
 * The FORC distribution rho(Ha, Hb) as a heatmap (rectangles centred on the grid points, a
 * diverging colour scale centred on 0) with the line Hb = Ha over the range of Ha. Points without rho
 * are left blank.
 */
export function forcHeatmapSpec(input: ForcHeatmapInput): PlotSpec {
  return gridHeatmapSpec(input);
}

/** Any column on the (Ha, Hb) grid as a heatmap (the FORC heatmap's layout). */
export function gridHeatmapSpec(input: ForcHeatmapInput): PlotSpec {
  const { reversalFields: ha, fields: hb } = input;
  const nb = hb.length;
  const dhb = nb > 1 ? hb[1]! - hb[0]! : 1;
  const half = (i: number, side: -1 | 1) => {
    const j = i + side;
    const gap = j >= 0 && j < ha.length ? Math.abs(ha[j]! - ha[i]!) : ha.length > 1 ? Math.abs(ha[1]! - ha[0]!) : dhb;
    return gap / 2;
  };
  const cells: Array<Record<string, number>> = [];
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < ha.length; i++) {
    for (let j = 0; j < nb; j++) {
      const v = input.rho[i * nb + j];
      if (v === null || v === undefined || !Number.isFinite(v)) continue;
      cells.push({
        ha: ha[i]!, hb: hb[j]!, rho: v,
        ha0: ha[i]! - half(i, -1), ha1: ha[i]! + half(i, 1), hb0: hb[j]! - dhb / 2, hb1: hb[j]! + dhb / 2,
      });
      lo = Math.min(lo, ha[i]! - half(i, -1));
      hi = Math.max(hi, ha[i]! + half(i, 1));
    }
  }
  const unit = input.fieldUnit ? ` (${input.fieldUnit})` : "";
  const extent = cells.reduce((m, c) => Math.max(m, Math.abs(c.rho!)), 0) || 1;
  const layers: PlotSpec[] = [
    {
      data: { values: cells },
      mark: { type: "rect" },
      encoding: {
        x: { field: "hb0", type: "quantitative", title: `field Hb${unit}`, scale: { zero: false, nice: false } },
        x2: { field: "hb1" },
        y: { field: "ha0", type: "quantitative", title: `reversal field Ha${unit}`, scale: { zero: false, nice: false } },
        y2: { field: "ha1" },
        color: {
          field: "rho", type: "quantitative", title: input.quantity ?? "rho", legend: { orient: "right" },
          scale: input.colorScale === "sequential"
            ? { scheme: "viridis" }
            : { scheme: "purpleorange", domain: [-extent, extent], domainMid: 0 },
        },
      },
      name: "forc-cells",
    },
  ];
  if (cells.length > 0) {
    layers.push({
      data: { values: [{ h: lo }, { h: hi }] },
      mark: { type: "line", color: "#475467", strokeDash: [4, 3], strokeWidth: 1, clip: true },
      encoding: { x: { field: "h", type: "quantitative" }, y: { field: "h", type: "quantitative" } },
      name: "diagonal",
    });
  }
  const sf = input.smoothingFactor !== undefined ? `, SF = ${input.smoothingFactor}` : "";
  return {
    $schema: SCHEMA,
    title: input.title ?? `FORC distribution rho(Ha, Hb)${sf}`,
    width: input.width ?? 380, height: input.height ?? 320, config: PLOT_CONFIG,
    layer: layers,
  };
}

/**
 * Hook for the spectrum layer: a plot builder for S(q) and period against field, registered by
 * that layer when it exists. Until then the report shows no spectrum section (no placeholder plot).
 */
export type SpectrumPlotHook = (columns: Record<string, number[]>, fieldUnit: string) => PlotSpec | null;

function fmt(x: number): string {
  return String(Number(x.toPrecision(6)));
}
