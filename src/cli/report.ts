// `domtopo report <run folder>`: one self-contained HTML file from a run folder's tables (plots as
// inline SVG rendered by headless vega, tables of the run record and options, loop metrics, frame
// or overlay thumbnails as inline PNG), written atomically.
import { existsSync, readdirSync, readFileSync, statSync } from "node:fs";
import { basename, join, resolve } from "node:path";
import { splitBranches, branchColumn } from "../sweep/branches";
import {
  branchTopologySpec, defectDensitySpec, fieldSeriesSpec, forcHeatmapSpec, gridHeatmapSpec, kindCountsSpec,
  loopPlotSpec, spectrumFieldSpec, spectrumProfilePlots,
  type FieldSeries, type PlotSpec, type SpectrumPlotHook, type SpectrumPlotInput, type TopologyBranch, BRANCH_COLORS,
} from "../render/plots";
import { renderSvg, type VegaModules } from "../render/svg";
import { reportHtml, type ReportSection, type ReportTable } from "../render/report-html";
import { readCsv, numericColumn, columnIndex, type CsvTable } from "./csv-table";
import { fieldUnitOf, fmt, loopMetricRows, type MetricRow } from "./loop-tables";
import { tableLoopMetrics } from "./loop";
import { writeFileAtomic } from "../node/atomic";
import { UsageError, parseCommand } from "./usage";
import { VERSION } from "../version";

export const REPORT_HELP = `Usage: domtopo report <run folder> [options]

Writes one self-contained HTML file (no scripts, no links out) from a run folder made by
'domtopo demo' or 'domtopo analyze --out': plots against field (SVG, inline), the run record and
options, loop metrics, the FORC distribution with contours and reversal-curve tables when
DIR/loop/ exists, the radial spectrum S(q) of DIR/spectra.csv with the images DIR/spectra/*.png
when they exist, and thumbnails of DIR/overlays/*.png (or of DIR/frames/*.png when there are no
overlays). Domain kinds, defect densities, period, correlation length and order are plotted
against field whenever the per-frame tables have those columns.

Options:
  --out FILE            where to write [DIR/report.html]
  --field-column NAME   field column of DIR/frames.csv [field_<unit> from run.json, or the
                        first column named field*; without one, quantities are plotted by frame]
  --thumbnails N        at most N thumbnails [8]
  --quiet               no summary
  -h, --help            this help`;

/** Options of {@link buildReport}. */
export interface ReportOptions {
  fieldColumn?: string;
  /** @default 8 */
  thumbnails?: number;
  /**
   * Builds the spectrum plots from DIR/spectra.csv (and the per-frame table).
   * @default spectrumProfilePlots (S(q) of each kept frame, log scale)
   */
  spectrumPlot?: SpectrumPlotHook;
}

function readJson(path: string): Record<string, any> | undefined {
  if (!existsSync(path)) return undefined;
  try {
    return JSON.parse(readFileSync(path, "utf8"));
  } catch (err) {
    throw new Error(`${path}: not readable JSON (${(err as Error).message})`);
  }
}

async function loadVega(): Promise<VegaModules> {
  const [vega, vegaLite] = await Promise.all([import("vega"), import("vega-lite")]);
  return { vega: vega as unknown as VegaModules["vega"], vegaLite: vegaLite as unknown as VegaModules["vegaLite"] };
}

function detectFieldColumn(t: CsvTable, run: Record<string, any> | undefined, given?: string): string | undefined {
  if (given) { columnIndex(t, given); return given; }
  const fromRun = run?.fieldUnit ? `field_${run.fieldUnit}` : undefined;
  if (fromRun && t.header.includes(fromRun)) return fromRun;
  return t.header.find((h) => /^field(_|$)/i.test(h));
}

function has(t: CsvTable, ...names: string[]): boolean {
  return names.every((n) => t.header.includes(n));
}

function cellText(v: unknown): string {
  if (v === null || v === undefined) return "";
  if (typeof v === "number") return fmt(v);
  if (typeof v === "object") return JSON.stringify(v);
  return String(v);
}

/** Per-branch series of the columns of a table, split by the field column. */
function branchSeries(t: CsvTable, field: number[]) {
  const split = splitBranches(field);
  const counts = { ascending: 0, descending: 0 };
  for (const b of split.branches) counts[b.direction]++;
  const seen = { ascending: 0, descending: 0 };
  const labels = split.branches.map((b) => {
    seen[b.direction]++;
    return counts[b.direction] > 1 ? `${b.direction} ${seen[b.direction]}` : b.direction;
  });
  return {
    split,
    labels,
    column: (name: string) => branchColumn(split, numericColumn(t, name)),
  };
}

function topologyBranches(t: CsvTable, field: number[], select?: (label: string, k: number) => boolean): TopologyBranch[] {
  const s = branchSeries(t, field);
  const f = branchColumn(s.split, field);
  const [ud, dd, ue, de] = ["up_domains", "down_domains", "up_euler", "down_euler"].map(s.column);
  return s.labels.map((label, k) => ({ label, field: f[k]!, upDomains: ud![k]!, downDomains: dd![k]!, upEuler: ue![k]!, downEuler: de![k]! }))
    .filter((b, k) => (select ? select(b.label, k) : true));
}

/** A column as numbers, NaN for empty or non-numeric cells (a frame without that value). */
function looseColumn(t: CsvTable, name: string): number[] {
  const k = columnIndex(t, name);
  return t.rows.map((r) => {
    const text = r[k]!.trim();
    const v = text === "" ? NaN : Number(text);
    return Number.isFinite(v) ? v : NaN;
  });
}

/** Frames of one branch of a table, by row. */
interface RowBranch {
  label: string;
  rows: number[];
}

/** Area densities per nm² are shown per µm² (values near 1 instead of 1e-6); others as written. */
function areaDensityUnit(unit: string): { factor: number; label: string; format?: string } {
  if (unit === "nm") return { factor: 1e6, label: "µm²" };
  if (unit === "µm" || unit === "um") return { factor: 1, label: "µm²" };
  return { factor: 1, label: `${unit}²`, format: ".2~e" };
}

/**
 * Plots of the per-frame columns written with skeletons and spectra: domain kinds of each phase,
 * ends and junctions per area, and period / correlation length / order; each only when the table
 * has its columns.
 */
async function kindAndSpectrumFigures(
  t: CsvTable, field: number[], branches: RowBranch[], fieldUnit: string, svg: (s: PlotSpec) => Promise<string>, where: string,
): Promise<string[]> {
  const figures: string[] = [];
  const pick = (values: number[], b: RowBranch) => b.rows.map((r) => values[r]!);
  const col = (name: string) => looseColumn(t, name);
  const fieldOf = (b: RowBranch) => pick(field, b);
  const kinds = ["bubbles", "stripes", "labyrinths"] as const;
  if (kinds.every((k) => has(t, `up_${k}`, `down_${k}`))) {
    const c = Object.fromEntries(kinds.flatMap((k) => [[`up_${k}`, col(`up_${k}`)], [`down_${k}`, col(`down_${k}`)]]));
    const counts = (phase: string, b: RowBranch) => ({
      bubbles: pick(c[`${phase}_bubbles`]!, b), stripes: pick(c[`${phase}_stripes`]!, b), labyrinths: pick(c[`${phase}_labyrinths`]!, b),
    });
    figures.push(await svg(kindCountsSpec({
      fieldUnit, title: `Domain kinds ${where}`,
      branches: branches.map((b) => ({ label: b.label, field: fieldOf(b), up: counts("up", b), down: counts("down", b) })),
    })));
  }
  const ends = t.header.map((h) => /^up_ends_per_(.+)2$/.exec(h)).find((m) => m !== null);
  const u = ends?.[1];
  if (u !== undefined && has(t, `down_ends_per_${u}2`, `up_junctions_per_${u}2`, `down_junctions_per_${u}2`)) {
    const d = areaDensityUnit(u);
    const scaled = (name: string) => col(name).map((v) => v * d.factor);
    const [ue, de, uj, dj] = [`up_ends_per_${u}2`, `down_ends_per_${u}2`, `up_junctions_per_${u}2`, `down_junctions_per_${u}2`].map(scaled);
    figures.push(await svg(defectDensitySpec({
      fieldUnit, areaUnit: d.label, title: `Defects ${where}`, ...(d.format ? { yFormat: d.format } : {}),
      branches: branches.map((b) => ({ label: b.label, field: fieldOf(b), upEnds: pick(ue!, b), downEnds: pick(de!, b), upJunctions: pick(uj!, b), downJunctions: pick(dj!, b) })),
    })));
  }
  const periodColumn = t.header.find((h) => /^period_(?!from_)/.test(h));
  if (periodColumn && has(t, "order2", "order6")) {
    const lengthUnit = periodColumn.slice("period_".length);
    const period = col(periodColumn);
    const corrName = `corr_length_${lengthUnit}`;
    // Only resolved correlation lengths: an unresolved one is a bound set by the frame.
    const resolved = has(t, "corr_length_resolved") ? col("corr_length_resolved") : undefined;
    const corr = has(t, corrName) ? col(corrName).map((v, r) => (resolved && resolved[r] !== 1 ? NaN : v)) : period.map(() => NaN);
    const [o2, o6] = [col("order2"), col("order6")];
    figures.push(await svg(spectrumFieldSpec({
      fieldUnit, lengthUnit, title: `Period, correlation length and order ${where}`,
      branches: branches.map((b) => ({ label: b.label, field: fieldOf(b), period: pick(period, b), corrLength: pick(corr, b), order2: pick(o2!, b), order6: pick(o6!, b) })),
    })));
  }
  return figures;
}

function metricsTable(rows: MetricRow[], caption: string): ReportTable {
  return {
    caption, head: ["quantity", "value", "unit", "note"], numeric: [1],
    rows: rows.map((r) => [r.quantity.replace(/_/g, " "), r.value === null ? "-" : fmt(r.value), r.unit === "1" ? "" : r.unit, r.reason]),
  };
}

function thumbnails(dir: string, max: number): { folder: string; items: Array<{ caption: string; src: string }> } | undefined {
  if (max <= 0) return undefined;
  for (const folder of ["overlays", "frames"]) {
    const d = join(dir, folder);
    if (!existsSync(d) || !statSync(d).isDirectory()) continue;
    const files = readdirSync(d).filter((f) => f.toLowerCase().endsWith(".png")).sort();
    if (files.length === 0) continue;
    const pick = files.length <= max ? files : Array.from({ length: max }, (_, k) => files[Math.round((k * (files.length - 1)) / Math.max(1, max - 1))]!);
    return {
      folder,
      items: [...new Set(pick)].map((f) => ({ caption: f, src: `data:image/png;base64,${readFileSync(join(d, f)).toString("base64")}` })),
    };
  }
  return undefined;
}

/** Builds the report of a run folder as an HTML string. */
export async function buildReport(dirIn: string, options: ReportOptions = {}, modules?: VegaModules): Promise<string> {
  const dir = resolve(dirIn);
  if (!existsSync(dir) || !statSync(dir).isDirectory()) throw new Error(`${dirIn}: not a folder`);
  const run = readJson(join(dir, "run.json"));
  const framesPath = join(dir, "frames.csv");
  const loopDir = join(dir, "loop");
  const loopFramesPath = join(loopDir, "frames.csv");
  if (!existsSync(framesPath) && !existsSync(loopFramesPath)) {
    throw new Error(`${dirIn}: expected a run folder with frames.csv (or loop/frames.csv), found neither`);
  }
  const vega = modules ?? (await loadVega());
  let plotCount = 0;
  const svg = (spec: PlotSpec) => renderSvg(spec, vega, `p${++plotCount}-`);
  const sections: ReportSection[] = [];
  const synthetic = run?.scenario && (run.command === "demo" || /synthetic/i.test(String(run.scenario))) ? String(run.scenario) : undefined;

  // The run record and its options.
  if (run) {
    const record: ReportTable = {
      caption: "Run record (run.json)", head: ["entry", "value"],
      rows: Object.entries(run).filter(([k, v]) => k !== "options" && k !== "scenario" && (typeof v !== "object" || v === null || Array.isArray(v)))
        .map(([k, v]) => [k, Array.isArray(v) ? (v.length > 6 ? `${v.slice(0, 6).map(cellText).join(", ")}, ... (${v.length})` : v.map(cellText).join(", ")) : cellText(v)]),
    };
    const tables = [record];
    if (run.options && typeof run.options === "object") {
      tables.push({ caption: "Frame options", head: ["option", "value"], rows: Object.entries(run.options).map(([k, v]) => [k, cellText(v)]) });
    }
    sections.push({ id: "run", title: "Run", intro: run.scenario ? String(run.scenario) : undefined, tables });
  }

  // The sweep of frames.csv.
  if (existsSync(framesPath)) {
    const t = readCsv(framesPath);
    const fieldColumn = detectFieldColumn(t, run, options.fieldColumn);
    const field = fieldColumn ? numericColumn(t, fieldColumn) : t.rows.map((_, k) => k);
    const unit = fieldColumn ? fieldUnitOf(fieldColumn) || fieldColumn : "";
    const figures: string[] = [];
    const s = branchSeries(t, field);
    const fieldByBranch = branchColumn(s.split, field);
    const branchColors = Object.fromEntries(s.labels.map((l) => [l, l.startsWith("ascending") ? BRANCH_COLORS.ascending : BRANCH_COLORS.descending]));
    if (has(t, "magnetization")) {
      const m = s.column("magnetization");
      figures.push(await svg(fieldSeriesSpec({
        fieldUnit: unit, yTitle: "magnetization m", title: "Magnetization against field",
        series: s.labels.map((label, k) => ({ name: label, group: label, field: fieldByBranch[k]!, values: m[k]! })),
        colors: branchColors,
      })));
    }
    if (has(t, "up_domains", "down_domains", "up_euler", "down_euler")) {
      figures.push(await svg(branchTopologySpec({ fieldUnit: unit, branches: topologyBranches(t, field) })));
    }
    const wall = t.header.find((h) => h.startsWith("wall_length_density"));
    if (wall) {
      const w = s.column(wall);
      figures.push(await svg(fieldSeriesSpec({
        fieldUnit: unit, yTitle: `wall length per area (${wall.replace(/^wall_length_density_/, "").replace(/_/g, " ")})`,
        title: "Wall length density against field",
        series: s.labels.map((label, k) => ({ name: label, group: label, field: fieldByBranch[k]!, values: w[k]! })),
        colors: branchColors,
      })));
    }
    const rowBranches = s.split.branches.map((b, k) => ({
      label: s.labels[k]!, rows: Array.from({ length: b.endFrame - b.startFrame + 1 }, (_, i) => b.startFrame + i),
    }));
    figures.push(...(await kindAndSpectrumFigures(t, field, rowBranches, unit, svg, "against field")));
    const tables: ReportTable[] = [];
    if (fieldColumn && has(t, "magnetization")) {
      try {
        tables.push(metricsTable(loopMetricRows(tableLoopMetrics(t, fieldColumn, "magnetization"), unit), "Loop metrics of this sweep"));
      } catch {
        // A single branch (the usual demo sweep) has no loop: nothing to tabulate.
      }
    }
    sections.push({
      id: "sweep", title: "Sweep",
      intro: `${t.rows.length} frames (frames.csv), ${fieldColumn ? `against ${fieldColumn}` : "by frame index (no field column)"}, ` +
        `${s.split.branches.length} branch${s.split.branches.length === 1 ? "" : "es"}.`,
      figures, tables,
    });
  }

  // The hysteretic sweep of loop/: major loop, reversal curves, FORC.
  if (existsSync(loopFramesPath)) sections.push(...(await loopSections(loopDir, svg)));

  const spectrum = await spectrumSection(dir, framesPath, run, options.spectrumPlot ?? spectrumProfilePlots, svg);
  if (spectrum) sections.push(spectrum);

  const thumbs = thumbnails(dir, options.thumbnails ?? 8);
  if (thumbs) {
    sections.push({
      id: "images", title: thumbs.folder === "overlays" ? "Overlays" : "Frames",
      intro: thumbs.folder === "overlays" ? undefined : "Frames as analyzed (this folder holds no overlays).",
      thumbnails: thumbs.items,
    });
  }

  return reportHtml({
    title: `domtopo report: ${basename(dir)}`,
    subtitle: `${dir}${run?.command ? ` (domtopo ${run.command}${run.version ? ` ${run.version}` : ""})` : ""}`,
    syntheticNote: synthetic ? "These frames were generated by domtopo's built-in demo; they are not measurements." : undefined,
    sections,
    footer: `Written by domtopo ${VERSION} report on ${new Date().toISOString().slice(0, 10)}. Plots rendered with Vega-Lite.`,
  });
}

/**
 * The radial profiles kept in DIR/spectra.csv (frame, field_<unit>, q_per_<unit>, S) through the
 * spectrum hook, and the spectrum images DIR/spectra/*.png; undefined when there are neither.
 */
async function spectrumSection(
  dir: string, framesPath: string, run: Record<string, any> | undefined, hook: SpectrumPlotHook, svg: (s: PlotSpec) => Promise<string>,
): Promise<ReportSection | undefined> {
  const csvPath = join(dir, "spectra.csv");
  const imageDir = join(dir, "spectra");
  const images = existsSync(imageDir) && statSync(imageDir).isDirectory()
    ? readdirSync(imageDir).filter((f) => f.toLowerCase().endsWith(".png")).sort() : [];
  if (!existsSync(csvPath) && images.length === 0) return undefined;
  const profiles: SpectrumPlotInput["profiles"] = [];
  let lengthUnit: string = run?.options?.unit ?? "";
  let fieldUnit: string = run?.fieldUnit ?? "";
  if (existsSync(csvPath)) {
    const t = readCsv(csvPath);
    const qColumn = t.header.find((h) => /^q(_|$)/.test(h));
    if (!qColumn || !has(t, "frame", "S")) throw new Error(`${csvPath}: expected columns frame, q_per_<unit> and S, got ${t.header.join(", ")}`);
    if (qColumn.startsWith("q_per_")) lengthUnit = qColumn.slice("q_per_".length);
    const fieldColumn = t.header.find((h) => /^field(_|$)/.test(h));
    if (fieldColumn) fieldUnit = fieldUnitOf(fieldColumn) || fieldUnit;
    const frame = numericColumn(t, "frame"), q = numericColumn(t, qColumn), sq = numericColumn(t, "S");
    const field = fieldColumn ? numericColumn(t, fieldColumn, { empty: "null" }) : undefined;
    const byFrame = new Map<number, SpectrumPlotInput["profiles"][number]>();
    t.rows.forEach((_, r) => {
      let p = byFrame.get(frame[r]!);
      if (!p) {
        p = { frame: frame[r]!, field: field?.[r] ?? undefined, q: [], s: [] };
        byFrame.set(frame[r]!, p);
        profiles.push(p);
      }
      p.q.push(q[r]!);
      p.s.push(sq[r]!);
    });
  }
  const columns: Record<string, number[]> = {};
  if (existsSync(framesPath)) {
    const t = readCsv(framesPath);
    for (const h of t.header) {
      const v = looseColumn(t, h);
      if (v.some(Number.isFinite)) columns[h] = v;
    }
  }
  const figures: string[] = [];
  for (const spec of hook({ columns, fieldUnit, lengthUnit, profiles })) figures.push(await svg(spec));
  const caption = (file: string) => {
    const m = /(\d+)\.png$/i.exec(file);
    const p = m ? profiles.find((x) => x.frame === Number(m[1])) : undefined;
    return p ? `frame ${p.frame}${p.field !== undefined ? `, H = ${fmt(p.field)} ${fieldUnit}` : ""}` : file;
  };
  return {
    id: "spectrum", title: "Spectrum",
    intro: [
      profiles.length ? `Radial profile S(q), the mean of the power spectrum of the phase map over each annulus, of ${profiles.length} frame${profiles.length === 1 ? "" : "s"} (spectra.csv); dashed: the ring q* = 1 / period.` : "",
      images.length ? "Images: centre of the log-scaled power spectrum (zero frequency in the middle, 4 decades), the ring q* drawn in red (spectra/*.png)." : "",
    ].filter(Boolean).join(" "),
    figures,
    thumbnails: images.map((f) => ({ caption: caption(f), src: `data:image/png;base64,${readFileSync(join(imageDir, f)).toString("base64")}` })),
  };
}

async function loopSections(loopDir: string, svg: (s: PlotSpec) => Promise<string>): Promise<ReportSection[]> {
  const loop = readJson(join(loopDir, "loop.json")) ?? {};
  const metricsJson = loop.loop ?? readJson(join(loopDir, "loop-metrics.json"));
  const forc = loop.forc ?? readJson(join(loopDir, "forc.json"));
  const t = readCsv(join(loopDir, "frames.csv"));
  const fieldColumn: string = loop.fieldColumn ?? t.header.find((h) => /^field(_|$)/i.test(h));
  if (!fieldColumn) throw new Error(`${t.file}: no field column (expected one named field*)`);
  const reversalColumn: string | undefined = loop.reversalColumn ?? t.header.find((h) => /^reversal_field/i.test(h));
  const unit = fieldUnitOf(fieldColumn) || loop.fieldUnit || "";
  const field = numericColumn(t, fieldColumn);
  const m = numericColumn(t, "magnetization");
  const segIndex = t.header.indexOf("segment");
  const segment = (r: number) => (segIndex >= 0 ? t.rows[r]![segIndex]! : "");
  const ha = reversalColumn ? numericColumn(t, reversalColumn, { empty: "null" }) : t.rows.map(() => null);

  const pick = (pred: (r: number) => boolean) => {
    const rows = t.rows.map((_, r) => r).filter(pred);
    return { rows, field: rows.map((r) => field[r]!), m: rows.map((r) => m[r]!) };
  };
  const desc = pick((r) => segment(r) === "major-descending");
  const asc = pick((r) => segment(r) === "major-ascending");
  const curveFields = [...new Set(ha.filter((h): h is number => h !== null))];
  const curves = curveFields.map((h) => ({ reversalField: h, ...pick((r) => ha[r] === h) }));

  const figures: string[] = [];
  figures.push(await svg(loopPlotSpec({
    fieldUnit: unit,
    major: [
      { direction: "descending", field: desc.field, magnetization: desc.m },
      { direction: "ascending", field: asc.field, magnetization: asc.m },
    ],
    reversalCurves: curves.map((c) => ({ reversalField: c.reversalField, field: c.field, magnetization: c.m })),
  })));
  if (has(t, "up_domains", "down_domains", "up_euler", "down_euler") && desc.rows.length > 1 && asc.rows.length > 1) {
    const col = (name: string, rows: number[]) => { const v = numericColumn(t, name); return rows.map((r) => v[r]!); };
    const branch = (label: string, p: typeof desc): TopologyBranch => ({
      label, field: p.field, upDomains: col("up_domains", p.rows), downDomains: col("down_domains", p.rows),
      upEuler: col("up_euler", p.rows), downEuler: col("down_euler", p.rows),
    });
    figures.push(await svg(branchTopologySpec({ fieldUnit: unit, title: "Topology on the major loop", branches: [branch("descending", desc), branch("ascending", asc)] })));
    const wall = t.header.find((h) => h.startsWith("wall_length_density"));
    if (wall) {
      const series: FieldSeries[] = [
        { name: "major descending", group: "major descending", field: desc.field, values: col(wall, desc.rows) },
        { name: "major ascending", group: "major ascending", field: asc.field, values: col(wall, asc.rows) },
      ];
      figures.push(await svg(fieldSeriesSpec({
        fieldUnit: unit, series, title: "Wall length density on the major loop",
        yTitle: `wall length per area (${wall.replace(/^wall_length_density_/, "").replace(/_/g, " ")})`,
        colors: { "major descending": BRANCH_COLORS.descending, "major ascending": BRANCH_COLORS.ascending },
      })));
    }
  }
  if (desc.rows.length > 1 && asc.rows.length > 1) {
    figures.push(...(await kindAndSpectrumFigures(t, field, [{ label: "descending", rows: desc.rows }, { label: "ascending", rows: asc.rows }], unit, svg, "on the major loop")));
  }
  if (forc?.rho && forc?.reversalFields && forc?.fields) {
    figures.push(await svg(forcHeatmapSpec({
      fieldUnit: unit, reversalFields: forc.reversalFields, fields: forc.fields, rho: forc.rho,
      smoothingFactor: forc.options?.smoothingFactor,
    })));
  }
  const topo = loop.topologyMap;
  if (topo?.reversalFields && topo?.fields && topo?.columns) {
    for (const [name, values] of Object.entries(topo.columns as Record<string, (number | null)[]>)) {
      figures.push(await svg(gridHeatmapSpec({
        fieldUnit: unit, reversalFields: topo.reversalFields, fields: topo.fields, rho: values,
        quantity: name.replace(/_/g, " "), colorScale: "sequential", title: `${name.replace(/_/g, " ")} on the reversal curves`, width: 360, height: 300,
      })));
    }
  }

  const tables: ReportTable[] = [];
  if (metricsJson?.metrics) {
    const rows: MetricRow[] = Object.entries(metricsJson.metrics as Record<string, any>).map(([q, v]) => ({
      quantity: q, value: typeof v === "number" ? v : null, reason: typeof v === "number" ? "" : String(v?.reason ?? ""),
      unit: /field|shift|area/.test(q) ? (q === "loop_area" ? `${unit}*magnetization` : unit) : q === "squareness" ? "1" : "magnetization",
    }));
    tables.push(metricsTable(rows, "Loop metrics of the major loop"));
  }
  if (forc?.counts) {
    const p = forc.peak;
    tables.push({
      caption: "FORC distribution", head: ["entry", "value"],
      rows: [
        ["method", String(forc.method ?? "local second-order fit")],
        ["smoothing factor SF", cellText(forc.options?.smoothingFactor)],
        ["grid", `${forc.reversalFields.length} Ha x ${forc.fields.length} Hb, step ${cellText(forc.options?.fieldStep)} ${unit}`],
        ["points with rho", cellText(forc.counts.ok)],
        ["peak rho", p ? `${fmt(p.rho)} at Ha = ${fmt(p.reversalField)}, Hb = ${fmt(p.field)} ${unit}` : "-"],
      ],
    });
  }
  if (Array.isArray(loop.excursions)) {
    tables.push({
      caption: "Excursions of the reversal curves from the major ascending branch",
      head: ["curve", `Ha (${unit})`, `leaves at (${unit})`, `rejoins at (${unit})`, "largest deviation of m", `area (${unit})`, "note"],
      numeric: [0, 1, 2, 3, 4, 5],
      rows: loop.excursions.map((e: any, k: number) => [k + 1, cellText(e.reversalField), cellText(e.leaveField), cellText(e.rejoinField), cellText(e.maxDeviation), cellText(e.area), cellText(e.reason)]),
    });
  }
  return [{
    id: "loop", title: "Loop and reversal curves",
    intro: `${t.rows.length} frames (loop/frames.csv): the major loop (${desc.rows.length} frames down, ${asc.rows.length} up) and ${curves.length} first-order reversal curves.` +
      (loop.scenario ? ` ${loop.scenario}` : ""),
    figures, tables,
  }];
}

export async function runReport(argv: string[]): Promise<number> {
  const { values, positionals } = parseCommand("report", argv, {
    out: { type: "string" }, "field-column": { type: "string" }, thumbnails: { type: "string" },
    quiet: { type: "boolean" }, help: { type: "boolean", short: "h" },
  });
  if (values.help) { process.stdout.write(REPORT_HELP + "\n"); return 0; }
  if (positionals.length !== 1) throw new UsageError(`report: expected one run folder, got ${positionals.length} arguments (see domtopo report --help)`);
  const thumbs = values.thumbnails === undefined ? 8 : Number(values.thumbnails);
  if (!Number.isInteger(thumbs) || thumbs < 0) throw new UsageError(`--thumbnails: expected an integer >= 0, got ${JSON.stringify(values.thumbnails)}`);
  const dir = positionals[0]!;
  const out = resolve((values.out as string | undefined) ?? join(dir, "report.html"));
  const html = await buildReport(dir, { fieldColumn: values["field-column"] as string | undefined, thumbnails: thumbs });
  writeFileAtomic(out, html);
  if (!values.quiet) process.stdout.write(`Wrote ${out} (${(html.length / 1024).toFixed(0)} kB)\n`);
  return 0;
}
