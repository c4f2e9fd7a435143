// The hysteretic part of `domtopo demo`: the synthetic major loop and reversal curves analyzed
// frame by frame, then loop metrics, FORC distribution, excursions from the major loop and a
// topology map on the (Ha, Hb) grid, written to DIR/loop/.
import { join } from "node:path";
import { hysteresisDemo, type HysteresisDemoOptions } from "../demo/hysteresis";
import { createAnalyzer } from "../topology/analyze";
import type { FrameOptions } from "../topology/options";
import { frameRow, csvLine, type Cell } from "../topology/rows";
import { loopMetrics, type LoopMetrics } from "../sweep/loop";
import { forcDistribution, type ForcDistribution } from "../sweep/forc";
import { excursions } from "../sweep/excursions";
import { columnCurvesOnReversalGrid } from "../sweep/topology-map";
import type { ReversalCurve } from "../sweep/reversal-curves";
import {
  excursionsCsv, forcCsv, forcJson, loopMetricRows, loopMetricsJson, metricRowsCsv,
} from "./loop-tables";
import { commitAll } from "./loop";
import { VERSION } from "../version";

/** SF of the demo's FORC distribution. */
const DEMO_SF = 2;
/** Columns resampled on the (Ha, Hb) grid for the topology map. */
const MAP_COLUMNS = ["up_domains", "up_euler"] as const;

export interface DemoLoopResult {
  frames: number;
  reversalCurves: number;
  metrics: LoopMetrics;
  forc: ForcDistribution;
  scenario: string;
  analysisMs: number;
}

export function runDemoLoop(out: string, options: FrameOptions, demo: HysteresisDemoOptions = {}): DemoLoopResult {
  const d = hysteresisDemo(demo);
  const u = d.fieldUnit;
  const fieldColumn = `field_${u}`, reversalColumn = `reversal_field_${u}`;
  const frameOptions: FrameOptions = { ...options, threshold: d.threshold, pixelSize: d.pixelSize, unit: d.unit };
  const analyzer = createAnalyzer(d.width, d.height);
  const columns = new Map<string, number[]>();
  let table = "";
  let analysisMs = 0;
  try {
    d.frames.forEach((info, k) => {
      const frame = d.frame(k);
      const t0 = performance.now();
      const r = analyzer.analyze(frame, frameOptions, `hysteresis demo frame ${k}`);
      analysisMs += performance.now() - t0;
      const row: Array<[string, Cell]> = [
        ["frame", k], ["segment", info.segment], [reversalColumn, info.reversalField ?? ""], [fieldColumn, info.field],
        ...frameRow(r),
      ];
      if (k === 0) table += csvLine(row.map(([name]) => name));
      table += csvLine(row.map(([, v]) => v));
      for (const [name, v] of row) {
        if (typeof v !== "number") continue;
        let c = columns.get(name);
        if (!c) columns.set(name, (c = []));
        c.push(v);
      }
    });
  } finally {
    analyzer.dispose();
  }
  const col = (name: string) => columns.get(name)!;
  const field = d.frames.map((f) => f.field);
  const m = col("magnetization");
  const rowsOf = (pred: (k: number) => boolean) => d.frames.map((_, k) => k).filter(pred);
  const majorRows = rowsOf((k) => d.frames[k]!.segment.startsWith("major"));
  const metrics = loopMetrics(majorRows.map((k) => field[k]!), majorRows.map((k) => m[k]!));
  const curveOf = (values: number[]): ReversalCurve[] => d.reversalFields.map((ha) => {
    const rows = rowsOf((k) => d.frames[k]!.reversalField === ha);
    return { reversalField: ha, field: rows.map((k) => field[k]!), values: rows.map((k) => values[k]!), frames: [rows[0]!, rows[rows.length - 1]!] };
  });
  const curves = curveOf(m);
  // Hb on the frames' own field step, so the grid samples every measured frame.
  const forc = forcDistribution(curves, { smoothingFactor: DEMO_SF, fieldStep: d.fieldStep });
  const ascRows = rowsOf((k) => d.frames[k]!.segment === "major-ascending");
  const ex = excursions(
    curves.map((c) => ({ field: c.field, values: c.values })),
    { field: ascRows.map((k) => field[k]!), values: ascRows.map((k) => m[k]!) },
    { tolerance: 0.01 },
  );
  const map = Object.fromEntries(MAP_COLUMNS.map((name) => [name, columnCurvesOnReversalGrid(curveOf(col(name)), forc)]));

  // Topology map in long format, on the FORC grid.
  let mapCsv = csvLine([reversalColumn, fieldColumn, ...MAP_COLUMNS]);
  const nb = forc.fields.length;
  forc.reversalFields.forEach((ha, i) => {
    forc.fields.forEach((hb, j) => {
      const cells = MAP_COLUMNS.map((name) => map[name]!.values[i * nb + j]);
      if (cells.every((v) => v === null)) return;
      mapCsv += csvLine([ha, hb, ...cells.map((v) => v ?? "")]);
    });
  });

  const json = {
    tool: "domtopo", version: VERSION, command: "demo", synthetic: true, scenario: d.scenario,
    model: d.model, width: d.width, height: d.height, pixelSize: d.pixelSize, unit: d.unit, fieldUnit: u,
    saturationField: d.saturationField, fieldStep: d.fieldStep, frames: d.frames.length,
    fieldColumn, reversalColumn, options: frameOptions,
    loop: loopMetricsJson(metrics, u),
    forc: forcJson(forc, u, { curves: curves.length }),
    excursions: ex.map((e, k) => ({
      reversalField: d.reversalFields[k], leaveField: e.leaveField.value ?? null, rejoinField: e.rejoinField.value ?? null,
      maxDeviation: e.maxDeviation.value?.deviation ?? null, maxDeviationField: e.maxDeviation.value?.field ?? null,
      area: e.area.value ?? null, absoluteArea: e.absoluteArea.value ?? null,
      reason: e.leaveField.reason ?? e.rejoinField.reason ?? null,
    })),
    excursionTolerance: 0.01,
    topologyMap: {
      reversalFields: forc.reversalFields, fields: forc.fields,
      columns: Object.fromEntries(MAP_COLUMNS.map((name) => [name, map[name]!.values])),
    },
  };
  const dir = join(out, "loop");
  commitAll([
    [join(dir, "frames.csv"), table],
    [join(dir, "loop.json"), JSON.stringify(json) + "\n"],
    [join(dir, "loop-metrics.csv"), metricRowsCsv(loopMetricRows(metrics, u))],
    [join(dir, "forc.csv"), forcCsv(forc, u)],
    [join(dir, "excursions.csv"), excursionsCsv(d.reversalFields, ex, u)],
    [join(dir, "topology-map.csv"), mapCsv],
  ]);
  return { frames: d.frames.length, reversalCurves: curves.length, metrics, forc, scenario: d.scenario, analysisMs };
}
