// `domtopo report <run folder>`: one self-contained HTML file from a run folder's tables (plots as
// inline SVG rendered by headless vega, tables of the run record and options, loop metrics, frame
// or overlay thumbnails as inline PNG), written atomically.
import { existsSync, readdirSync, readFileSync, statSync } from "node:fs";
import { basename, join, resolve } from "node:path";
import { splitBranches, branchColumn } from "../sweep/branches";
import {
  branchTopologySpec, fieldSeriesSpec, forcHeatmapSpec, gridHeatmapSpec, loopPlotSpec,
  type FieldSeries, type PlotSpec, type SpectrumPlotHook, type TopologyBranch, BRANCH_COLORS,
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
options, loop metrics, the FORC distribution and reversal-curve tables when DIR/loop/ exists, and
thumbnails of DIR/overlays/*.png (or of DIR/frames/*.png when there are no overlays).

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
  /** Plug-in of the spectrum layer (S(q), period against field); no section without it. */
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
    if (has(t, "magnetization")) {
      const m = s.column("magnetization");
      figures.push(await svg(fieldSeriesSpec({
        fieldUnit: unit, yTitle: "magnetization m", title: "Magnetization against field",
        series: s.labels.map((label, k) => ({ name: label, group: label, field: fieldByBranch[k]!, values: m[k]! })),
        colors: Object.fromEntries(s.labels.map((l) => [l, l.startsWith("ascending") ? BRANCH_COLORS.ascending : BRANCH_COLORS.descending])),
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
      })));
    }
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

  if (options.spectrumPlot) {
    // Hook for the spectrum layer: it decides whether the table holds what it needs.
    const t = existsSync(framesPath) ? readCsv(framesPath) : undefined;
    if (t) {
      const cols: Record<string, number[]> = {};
      for (const h of t.header) {
        try { cols[h] = numericColumn(t, h); } catch { /* not numeric */ }
      }
      const spec = options.spectrumPlot(cols, run?.fieldUnit ?? "");
      if (spec) sections.push({ id: "spectrum", title: "Spectrum", figures: [await svg(spec)] });
    }
  }

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
