// Plot specifications (Vega-Lite v6 JSON) for quantities against field: the loop m(H) with its
// reversal curves, domain counts and Euler numbers on each branch, domain kinds and defect
// densities, wall length density, period / correlation length / order, the radial spectrum S(q),
// and the FORC distribution as a heatmap with contours. Browser-safe: plain data in, plain JSON
// out; the same spec can be rendered to SVG in Node (see ./svg.ts) or embedded in a page with
// vega-embed.
import { CONTOUR_FRACTIONS, forcContours } from "./contours";

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

/**
 * Long-format rows of several series; `order` keeps each series in sweep order, and `part`
 * numbers the runs of finite values so that a line breaks where a value is missing.
 */
function seriesRows(series: FieldSeries[]): Array<Record<string, number | string>> {
  const rows: Array<Record<string, number | string>> = [];
  series.forEach((s, index) => {
    const n = Math.min(s.field.length, s.values.length);
    let part = 0, gap = false;
    for (let k = 0; k < n; k++) {
      const h = s.field[k]!, v = s.values[k]!;
      if (!Number.isFinite(h) || !Number.isFinite(v)) { gap = true; continue; }
      if (gap) { part++; gap = false; }
      rows.push({ field: h, value: v, series: s.name, group: s.group ?? "", order: k, part: `${index}.${part}` });
    }
  });
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
  // The x axis spans every frame with a field, also those without a value (a panel of a
  // quantity that exists only on part of the sweep keeps the sweep's field range).
  let lo = Infinity, hi = -Infinity;
  for (const s of input.series) {
    for (let k = 0; k < s.field.length; k++) {
      const h = s.field[k]!;
      if (Number.isFinite(h)) { lo = Math.min(lo, h); hi = Math.max(hi, h); }
    }
  }
  const encoding: PlotSpec = {
    x: { field: "field", type: "quantitative", title: fieldTitle(input.fieldUnit), ...(lo < hi ? { scale: { domain: [lo, hi] } } : {}) },
    y: { field: "value", type: "quantitative", title: input.yTitle },
    color, order: { field: "order" }, detail: { field: "part" },
  };
  // Dashes only when they say something the colours do not (groups other than the series).
  const sameAsSeries = groups.length === names.length && input.series.every((x) => (x.group ?? "") === x.name);
  if (groups.length > 1 && !sameAsSeries) {
    encoding.strokeDash = {
      field: "group", type: "nominal", title: input.groupTitle ?? "branch",
      scale: { domain: groups, range: groups.map((_, k) => (k === 0 ? [1, 0] : [5, 3])) },
      legend: { symbolType: "stroke", symbolStrokeWidth: 1.5, encode: { symbols: { update: { stroke: { value: "#475467" }, fill: { value: "transparent" } } } } },
    };
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

/** One panel of {@link stackedPanelsSpec}: a y quantity with its series. */
export interface FieldPanel {
  yTitle: string;
  series: FieldSeries[];
  colors?: Record<string, string>;
  /** A d3 number format for the y axis (e.g. "~e"). */
  yFormat?: string;
}

/** Panels against the same field axis stacked vertically, sharing colours and dash patterns. */
export function stackedPanelsSpec(input: { fieldUnit: string; title: string; panels: FieldPanel[] } & PlotSize): PlotSpec {
  return {
    $schema: SCHEMA, config: PLOT_CONFIG, title: input.title,
    vconcat: input.panels.map((p) => {
      const s = fieldSeriesSpec({ fieldUnit: input.fieldUnit, series: p.series, yTitle: p.yTitle, colors: p.colors, width: input.width, height: input.height ?? 180 });
      delete s.$schema; delete s.config;
      s.title = p.yTitle;
      if (p.yFormat) ((s.encoding as PlotSpec).y as PlotSpec).axis = { format: p.yFormat };
      return s;
    }),
    // One legend when every panel has the same series, else one per panel.
    resolve: { scale: { x: "shared", color: same((p) => p.series.map((x) => x.name)), strokeDash: same((p) => p.series.map((x) => x.group ?? "")) } },
  };
  function same(names: (p: FieldPanel) => string[]): "shared" | "independent" {
    const key = (p: FieldPanel) => [...new Set(names(p))].sort().join("\u0000");
    return input.panels.every((p) => key(p) === key(input.panels[0]!)) ? "shared" : "independent";
  }
}

/** Series of both phases on every branch: colour = phase, dash = branch. */
function phaseSeries<B extends { label: string; field: ArrayLike<number> }>(branches: B[], pick: (b: B) => [ArrayLike<number>, ArrayLike<number>]): FieldSeries[] {
  const series: FieldSeries[] = [];
  for (const b of branches) {
    const [up, down] = pick(b);
    series.push({ name: "up", group: b.label, field: b.field, values: up });
    series.push({ name: "down", group: b.label, field: b.field, values: down });
  }
  return series;
}

/** Up/down domain counts and Euler numbers against field on each branch: two stacked panels. */
export function branchTopologySpec(input: { fieldUnit: string; branches: TopologyBranch[]; title?: string } & PlotSize): PlotSpec {
  return stackedPanelsSpec({
    fieldUnit: input.fieldUnit, width: input.width, height: input.height,
    title: input.title ?? "Topology against field",
    panels: [
      { yTitle: "domains of each phase", series: phaseSeries(input.branches, (b) => [b.upDomains, b.downDomains]), colors: PHASE_COLORS },
      { yTitle: "Euler number of each phase", series: phaseSeries(input.branches, (b) => [b.upEuler, b.downEuler]), colors: PHASE_COLORS },
    ],
  });
}

/** Colours of the three kinds, the same hues as the overlays (src/render/overlay.ts). */
export const KIND_COLORS = { bubbles: "#56b4e9", stripes: "#009e73", labyrinths: "#d55e00" } as const;

/** Counts of each kind in one phase. */
export interface KindCounts {
  bubbles: ArrayLike<number>;
  stripes: ArrayLike<number>;
  labyrinths: ArrayLike<number>;
}

/** A branch with per-frame kind counts of both phases, for {@link kindCountsSpec}. */
export interface KindBranch {
  label: string;
  field: ArrayLike<number>;
  up: KindCounts;
  down: KindCounts;
}

/** Bubbles, stripes and labyrinths of each phase against field: one panel per phase. */
export function kindCountsSpec(input: { fieldUnit: string; branches: KindBranch[]; title?: string } & PlotSize): PlotSpec {
  const panel = (phase: "up" | "down"): FieldPanel => ({
    yTitle: `${phase} domains of each kind`, colors: KIND_COLORS,
    series: input.branches.flatMap((b) => (["bubbles", "stripes", "labyrinths"] as const).map((kind) => ({
      name: kind, group: b.label, field: b.field, values: b[phase][kind],
    }))),
  });
  return stackedPanelsSpec({
    fieldUnit: input.fieldUnit, width: input.width, height: input.height,
    title: input.title ?? "Domain kinds against field", panels: [panel("up"), panel("down")],
  });
}

/** A branch with per-frame defect densities of both phases, for {@link defectDensitySpec}. */
export interface DefectBranch {
  label: string;
  field: ArrayLike<number>;
  upEnds: ArrayLike<number>;
  downEnds: ArrayLike<number>;
  upJunctions: ArrayLike<number>;
  downJunctions: ArrayLike<number>;
}

/**
 * Skeleton ends and junctions per area of each phase against field: two panels. `areaUnit`
 * names the densities' unit (e.g. "µm²"); the values are plotted as given.
 */
export function defectDensitySpec(input: { fieldUnit: string; areaUnit: string; branches: DefectBranch[]; title?: string; yFormat?: string } & PlotSize): PlotSpec {
  const per = input.areaUnit ? ` (per ${input.areaUnit})` : "";
  return stackedPanelsSpec({
    fieldUnit: input.fieldUnit, width: input.width, height: input.height,
    title: input.title ?? "Defects against field",
    panels: [
      { yTitle: `stripe ends per area${per}`, series: phaseSeries(input.branches, (b) => [b.upEnds, b.downEnds]), colors: PHASE_COLORS, yFormat: input.yFormat },
      { yTitle: `junctions per area${per}`, series: phaseSeries(input.branches, (b) => [b.upJunctions, b.downJunctions]), colors: PHASE_COLORS, yFormat: input.yFormat },
    ],
  });
}

/** Colours of the spectrum quantities against field. */
export const SPECTRUM_COLORS = {
  period: "#344054", "correlation length": "#0e9384", "2-fold order": "#7a5af8", "6-fold order": "#dd2590",
} as const;

/** A branch with per-frame spectrum columns, for {@link spectrumFieldSpec} (NaN: no value). */
export interface SpectrumBranch {
  label: string;
  field: ArrayLike<number>;
  period: ArrayLike<number>;
  /** Only where the ring width is resolved (NaN elsewhere). */
  corrLength: ArrayLike<number>;
  order2: ArrayLike<number>;
  order6: ArrayLike<number>;
}

/** Period and correlation length (one panel) and 2- and 6-fold order (another) against field. */
export function spectrumFieldSpec(input: { fieldUnit: string; lengthUnit: string; branches: SpectrumBranch[]; title?: string } & PlotSize): PlotSpec {
  const of = (name: keyof typeof SPECTRUM_COLORS, pick: (b: SpectrumBranch) => ArrayLike<number>): FieldSeries[] =>
    input.branches.map((b) => ({ name, group: b.label, field: b.field, values: pick(b) }));
  const unit = input.lengthUnit ? ` (${input.lengthUnit})` : "";
  return stackedPanelsSpec({
    fieldUnit: input.fieldUnit, width: input.width, height: input.height,
    title: input.title ?? "Period, correlation length and order against field",
    panels: [
      { yTitle: `period and correlation length${unit}`, colors: SPECTRUM_COLORS, series: [...of("period", (b) => b.period), ...of("correlation length", (b) => b.corrLength)] },
      { yTitle: "orientational order of the ring", colors: SPECTRUM_COLORS, series: [...of("2-fold order", (b) => b.order2), ...of("6-fold order", (b) => b.order6)] },
    ],
  });
}

/** One radial profile for {@link spectrumProfileSpec}. */
export interface SpectrumProfileSeries {
  /** Legend entry (e.g. "frame 20, H = 0 mT"). */
  name: string;
  /** Bin centres, cycles per length unit. */
  q: ArrayLike<number>;
  /** S(q), the annulus mean of the power spectrum. */
  s: ArrayLike<number>;
  /** The ring q* (drawn as a dashed rule), cycles per length unit. */
  peakQ?: number;
}

/** Colours of successive profiles. */
const PROFILE_COLORS = ["#3b5b92", "#c8741a", "#0e9384", "#7a5af8", "#b42318", "#667085"];

/**
 * The radial spectrum S(q) of a few frames, one line each, on a logarithmic S axis; q* of each
 * frame as a dashed rule. The bin q = 0 (the removed mean) and bins with S <= 0 (which a log axis
 * cannot show) are left out.
 */
export function spectrumProfileSpec(input: { lengthUnit: string; profiles: SpectrumProfileSeries[]; qMax?: number; title?: string } & PlotSize): PlotSpec {
  const rows: Array<Record<string, number | string>> = [];
  for (const p of input.profiles) {
    const n = Math.min(p.q.length, p.s.length);
    for (let k = 0; k < n; k++) {
      const q = p.q[k]!, v = p.s[k]!;
      if (!(Number.isFinite(q) && q > 0 && Number.isFinite(v) && v > 0)) continue;
      if (input.qMax !== undefined && q > input.qMax) continue;
      rows.push({ q, s: v, series: p.name, order: k });
    }
  }
  const names = input.profiles.map((p) => p.name);
  const color = {
    field: "series", type: "nominal", title: null, legend: { labelLimit: 320 },
    scale: { domain: names, range: names.map((_, k) => PROFILE_COLORS[k % PROFILE_COLORS.length]) },
  };
  const unit = input.lengthUnit || "px";
  const x = { field: "q", type: "quantitative", title: `q (cycles per ${unit})`, scale: { zero: true, nice: false, ...(input.qMax !== undefined ? { domain: [0, input.qMax] } : {}) } };
  const layers: PlotSpec[] = [{
    data: { values: rows },
    mark: { type: "line", strokeWidth: 1.8, clip: true },
    encoding: { x, y: { field: "s", type: "quantitative", title: "S(q) (annulus mean, log scale)", scale: { type: "log" } }, color, order: { field: "order" } },
    name: "profiles",
  }];
  const peaks = input.profiles.filter((p) => p.peakQ !== undefined && Number.isFinite(p.peakQ) && p.peakQ > 0).map((p) => ({ q: p.peakQ!, series: p.name }));
  if (peaks.length > 0) {
    layers.push({
      data: { values: peaks },
      mark: { type: "rule", strokeDash: [4, 3], strokeWidth: 1 },
      encoding: { x: { field: "q", type: "quantitative" }, color },
      name: "ring-q",
    });
  }
  return {
    $schema: SCHEMA, title: input.title ?? "Radial spectrum S(q)",
    width: input.width ?? 440, height: input.height ?? 300, config: PLOT_CONFIG, layer: layers,
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
  /**
   * FORC heatmap only: contour levels as fractions of the peak rho, drawn as lines over the
   * cells; `[]` draws none. @default [0.1, 0.3, 0.5, 0.7, 0.9]
   */
  contourLevels?: readonly number[];
}

/**
 * The FORC distribution rho(Ha, Hb) as a heatmap (rectangles centred on the grid points, a
 * diverging colour scale centred on 0) with the line Hb = Ha over the range of Ha and contours at
 * fractions of the peak rho (one line layer per level, named `contour-<percent>`). Points without
 * rho are left blank and interrupt the contours.
 */
export function forcHeatmapSpec(input: ForcHeatmapInput): PlotSpec {
  const spec = gridHeatmapSpec(input);
  const fractions = input.contourLevels ?? CONTOUR_FRACTIONS;
  if (fractions.length === 0) return spec;
  const contours = forcContours(input, fractions);
  const layers = spec.layer as PlotSpec[];
  contours.forEach((c, k) => {
    const rows: Array<Record<string, number>> = [];
    c.lines.forEach((l, line) => l.field.forEach((hb, order) => rows.push({ hb, ha: l.reversalField[order]!, line, order })));
    if (rows.length === 0) return;
    layers.push({
      data: { values: rows },
      mark: { type: "line", color: "#101828", strokeWidth: 0.7 + 0.9 * (k / Math.max(1, contours.length - 1)), strokeOpacity: 0.85, clip: true },
      encoding: {
        x: { field: "hb", type: "quantitative" }, y: { field: "ha", type: "quantitative" },
        detail: { field: "line" }, order: { field: "order" },
      },
      name: `contour-${Math.round(c.fraction * 100)}`,
    });
  });
  const drawn = contours.filter((c) => c.lines.length > 0).map((c) => fmt(c.fraction * 100));
  if (drawn.length > 0) {
    spec.title = { text: spec.title as string, subtitle: `contours at ${drawn.join(", ")} % of the peak rho`, subtitleColor: "#475467" };
  }
  return spec;
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

/** What the report hands the spectrum hook. */
export interface SpectrumPlotInput {
  /** Numeric columns of the per-frame table (NaN for empty cells). */
  columns: Record<string, number[]>;
  fieldUnit: string;
  lengthUnit: string;
  /** Radial profiles kept by the run (DIR/spectra.csv), one per frame; may be empty. */
  profiles: Array<{ frame: number; field: number | undefined; q: number[]; s: number[] }>;
}

/**
 * Hook for the spectrum plots of the report: plot specs built from the kept radial profiles (and
 * the per-frame table); no specs, no spectrum plots. The default is {@link spectrumProfilePlots}.
 */
export type SpectrumPlotHook = (input: SpectrumPlotInput) => PlotSpec[];

/**
 * The default spectrum hook: S(q) of each kept profile, with q* = 1 / period from the table's
 * `period_<unit>` column when it has the frame, up to 4 q* of the largest ring (or the whole
 * profile without one).
 */
export const spectrumProfilePlots: SpectrumPlotHook = (input) => {
  if (input.profiles.length === 0) return [];
  const frames = input.columns.frame;
  const period = input.columns[`period_${input.lengthUnit.replace(/[^A-Za-z0-9µ]+/g, "")}`];
  const fieldUnit = input.fieldUnit ? ` ${input.fieldUnit}` : "";
  const profiles: SpectrumProfileSeries[] = input.profiles.map((p) => {
    const row = frames ? frames.indexOf(p.frame) : -1;
    const per = row >= 0 && period ? period[row]! : NaN;
    return {
      name: `frame ${p.frame}${p.field !== undefined ? `, H = ${fmt(p.field)}${fieldUnit}` : ""}`,
      q: p.q, s: p.s, ...(Number.isFinite(per) && per > 0 ? { peakQ: 1 / per } : {}),
    };
  });
  const rings = profiles.map((p) => p.peakQ ?? 0);
  const qMax = Math.max(...rings) > 0 ? 4 * Math.max(...rings) : undefined;
  return [spectrumProfileSpec({ lengthUnit: input.lengthUnit, profiles, ...(qMax !== undefined ? { qMax } : {}) })];
};

function fmt(x: number): string {
  return String(Number(x.toPrecision(6)));
}
