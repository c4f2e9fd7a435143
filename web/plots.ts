// Per-frame quantities against field as Vega-Lite plots (the library's spec builder), rendered
// to SVG in the page by a vega View; a click on a point names the frame it belongs to.
import { parse, View } from "vega";
import { compile } from "vega-lite";
import { fieldSeriesSpec, type FieldSeries, type PlotSpec } from "../src/render/plots";
import type { Cell } from "../src/index";

/** Okabe-Ito colours (Okabe & Ito 2008): phases orange / blue, kinds as in the overlay. */
const PHASES = { up: "#e69f00", down: "#0072b2" };
const KINDS = { bubbles: "#56b4e9", stripes: "#009e73", labyrinths: "#d55e00" };

export interface PlotInput {
  /** Field (or frame number) of each analyzed frame, in frame order. */
  x: number[];
  /** Frame number of each analyzed frame. */
  frames: number[];
  rows: Array<Map<string, Cell>>;
  fieldUnit: string;
  unit: string;
}

export interface PlotDef { id: string; title: string; spec: PlotSpec }

function column(rows: Array<Map<string, Cell>>, name: string): number[] {
  return rows.map((r) => {
    const v = r.get(name);
    return typeof v === "number" ? v : NaN;
  });
}

function suffix(unit: string): string {
  return unit.replace(/[^A-Za-z0-9µ]+/g, "");
}

export function plotDefs(input: PlotInput, width: number): PlotDef[] {
  const { x, rows, fieldUnit } = input;
  const u = suffix(input.unit);
  const size = { width, height: Math.round(width * 0.5) };
  const phases = (stem: string): FieldSeries[] => (["up", "down"] as const).map((p) => ({
    name: p, group: p, field: x, values: column(rows, `${p}_${stem}`),
  }));
  const defs: PlotDef[] = [
    { id: "magnetization", title: "magnetization m", spec: fieldSeriesSpec({
      ...size, fieldUnit, yTitle: "magnetization m", title: "Magnetization",
      series: [{ name: "m", field: x, values: column(rows, "magnetization") }], colors: { m: "#1d2433" },
    }) },
    { id: "domains", title: "domains of each phase", spec: fieldSeriesSpec({
      ...size, fieldUnit, yTitle: "domains", title: "Domains of each phase", series: phases("domains"), colors: PHASES,
    }) },
    { id: "euler", title: "Euler number of each phase", spec: fieldSeriesSpec({
      ...size, fieldUnit, yTitle: "Euler number", title: "Euler number of each phase", series: phases("euler"), colors: PHASES,
    }) },
    { id: "kinds", title: "bubbles, stripes and labyrinths", spec: fieldSeriesSpec({
      ...size, fieldUnit, yTitle: "domains", title: "Bubbles, stripes, labyrinths (solid up, dashed down)", groupTitle: "phase",
      colors: KINDS,
      series: (["up", "down"] as const).flatMap((p) => (["bubbles", "stripes", "labyrinths"] as const).map((k) => ({
        name: k, group: p, field: x, values: column(rows, `${p}_${k}`),
      }))),
    }) },
    { id: "walls", title: "wall length density", spec: fieldSeriesSpec({
      ...size, fieldUnit, yTitle: `wall length per area (1/${input.unit})`, title: "Wall length density",
      series: [{ name: "walls", field: x, values: column(rows, `wall_length_density_per_${u}`) }], colors: { walls: "#1d2433" },
    }) },
    { id: "period", title: "domain period", spec: fieldSeriesSpec({
      ...size, fieldUnit, yTitle: `period (${input.unit})`, title: "Domain period (spectrum ring)",
      series: [{ name: "period", field: x, values: column(rows, `period_${u}`) }], colors: { period: "#1d2433" },
    }) },
  ];
  for (const d of defs) clickable(d.spec);
  return defs;
}

/** Points on every line (the click targets) and a tooltip naming the frame. */
function clickable(spec: PlotSpec): void {
  const mark = spec.mark as Record<string, unknown>;
  spec.mark = { ...mark, point: { size: 30, filled: true, cursor: "pointer" } };
  const encoding = spec.encoding as Record<string, unknown>;
  encoding.tooltip = [
    { field: "series", type: "nominal", title: "series" },
    { field: "field", type: "quantitative", title: "x" },
    { field: "value", type: "quantitative", title: "value", format: ".4~g" },
  ];
}

export interface RenderedPlot { view: View; def: PlotDef }

/** Renders the plots into `host`; `onPick(frame)` is called when a point is clicked. */
export async function renderPlots(
  host: HTMLElement, defs: PlotDef[], frames: number[], onPick: (frame: number) => void, old: RenderedPlot[],
): Promise<RenderedPlot[]> {
  for (const p of old) p.view.finalize();
  host.replaceChildren();
  const out: RenderedPlot[] = [];
  for (const def of defs) {
    const box = document.createElement("figure");
    box.className = "plot";
    box.id = `plot-${def.id}`;
    box.setAttribute("role", "img");
    box.setAttribute("aria-label", `Plot: ${def.title} against ${frames.length} frames`);
    host.append(box);
    const view = new View(parse(compile(def.spec as never).spec), { renderer: "svg", container: box, hover: true, logLevel: 0 });
    view.addEventListener("click", (_event, item) => {
      const datum = (item as { datum?: { order?: number }; mark?: { marktype?: string } } | null | undefined);
      if (!datum || datum.mark?.marktype !== "symbol" || typeof datum.datum?.order !== "number") return;
      const frame = frames[datum.datum.order];
      if (frame !== undefined) onPick(frame);
    });
    await view.runAsync();
    out.push({ view, def });
  }
  return out;
}

/** SVG text of a rendered plot, for the report. */
export async function plotSvg(def: PlotDef): Promise<string> {
  const view = new View(parse(compile(def.spec as never).spec), { renderer: "none", logLevel: 0 });
  try {
    return await view.toSVG();
  } finally {
    view.finalize();
  }
}
