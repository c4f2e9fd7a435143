// What the page saves: the per-frame table and the domain table (the same columns as the
// command line's frames.csv and domains.csv), a run record, and a one-file HTML report.
import { csvCell, csvLine, domainHeader, VERSION, type Cell, type FrameOptions } from "../src/index";
import type { FrameReply } from "./protocol";

export interface RunRecord {
  options: FrameOptions;
  inputs: Array<{ name: string; bytes: number; frames: number; error?: string }>;
  field: { source: string; unit: string; values: number } | null;
  frames: number;
  failed: Array<{ frame: number; where: string; message: string }>;
  workers: number;
  seconds: number;
}

export interface Table {
  /** Analyzed frames in frame order. */
  replies: FrameReply[];
  /** Field of each analyzed frame (same order), when a field is given. */
  field?: { name: string; values: number[] };
}

function lead(t: Table, k: number): Array<[string, Cell]> {
  const r = t.replies[k]!;
  const cells: Array<[string, Cell]> = [["frame", r.index], ["source", r.where]];
  if (t.field) cells.push([t.field.name, t.field.values[k]!]);
  return cells;
}

export function framesCsv(t: Table): string {
  if (t.replies.length === 0) return "";
  let text = csvLine([...lead(t, 0), ...t.replies[0]!.row].map(([k]) => k));
  t.replies.forEach((r, k) => { text += csvLine([...lead(t, k), ...r.row].map(([, v]) => v)); });
  return text;
}

export function domainsCsv(t: Table, unit: string): string {
  const head = ["frame", "source", ...(t.field ? [t.field.name] : []), ...domainHeader(unit, true)];
  let text = csvLine(head);
  t.replies.forEach((r, k) => {
    const cells = lead(t, k).map(([, v]) => v);
    for (const d of r.domainRows) text += csvLine([...cells, ...d]);
  });
  return text;
}

export function manifestJson(record: RunRecord): string {
  return JSON.stringify({
    program: "domtopo (browser page)", version: VERSION, created: new Date().toISOString(),
    ...record,
  }, null, 2) + "\n";
}

const esc = (s: string) => s.replace(/[&<>"]/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;" })[c]!);

export interface ReportInput {
  record: RunRecord;
  table: Table;
  plots: string[];
  loopRows: Array<[string, string]>;
  frameImage?: { caption: string; dataUrl: string };
}

/** A self-contained HTML report: options, inputs, plots (inline SVG), loop, the per-frame table. */
export function reportHtml(input: ReportInput): string {
  const { record, table } = input;
  const opts = Object.entries(record.options).map(([k, v]) => `<tr><th>${esc(k)}</th><td>${esc(typeof v === "object" ? JSON.stringify(v) : String(v))}</td></tr>`).join("");
  const files = record.inputs.map((f) => `<tr><td>${esc(f.name)}</td><td>${f.bytes}</td><td>${f.frames}</td><td>${esc(f.error ?? "")}</td></tr>`).join("");
  const failed = record.failed.length
    ? `<h2>Frames not analyzed</h2><ul>${record.failed.map((f) => `<li>frame ${f.frame} (${esc(f.where)}): ${esc(f.message)}</li>`).join("")}</ul>` : "";
  const loop = input.loopRows.length
    ? `<h2>Loop</h2><table>${input.loopRows.map(([k, v]) => `<tr><th>${esc(k)}</th><td>${esc(v)}</td></tr>`).join("")}</table>` : "";
  const keys = ["frame", "source", ...(table.field ? [table.field.name] : []), "magnetization", "up_domains", "down_domains",
    "up_euler", "down_euler", "up_bubbles", "up_stripes", "up_labyrinths", "down_bubbles", "down_stripes", "down_labyrinths"];
  const body = table.replies.map((r, k) => {
    const m = new Map<string, Cell>([...lead(table, k), ...r.row]);
    return `<tr>${keys.map((c) => `<td>${esc(csvCell(m.get(c) ?? ""))}</td>`).join("")}</tr>`;
  }).join("\n");
  const image = input.frameImage
    ? `<figure><img src="${input.frameImage.dataUrl}" alt="${esc(input.frameImage.caption)}" style="max-width:28rem;image-rendering:pixelated"><figcaption>${esc(input.frameImage.caption)}</figcaption></figure>` : "";
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>domtopo report</title>
<style>body{font-family:system-ui,sans-serif;margin:1.5rem;color:#1d2433;max-width:80rem}
table{border-collapse:collapse;font-size:.85rem;margin:.4rem 0 1rem}th,td{border-bottom:1px solid #dde2e8;padding:.15rem .6rem;text-align:left}
td{font-variant-numeric:tabular-nums}.plots{display:flex;flex-wrap:wrap;gap:1rem}h2{font-size:1.05rem;margin-top:1.4rem}</style></head>
<body>
<h1>domtopo report</h1>
<p>Made by the domtopo browser page, version ${esc(VERSION)}, on ${esc(new Date().toISOString())}: ${table.replies.length} of ${record.frames} frames analyzed
with ${record.workers} worker(s) in ${record.seconds.toFixed(2)} s.</p>
<h2>Options</h2><table>${opts}</table>
<h2>Inputs</h2><table><tr><th>file</th><th>bytes</th><th>frames</th><th>problem</th></tr>${files}</table>
${record.field ? `<p>Field: ${esc(record.field.source)} (${esc(record.field.unit || "no unit")}).</p>` : "<p>No field given: plots run against frame number.</p>"}
${failed}
${image}
<h2>Plots</h2><div class="plots">${input.plots.join("\n")}</div>
${loop}
<h2>Frames</h2><table><tr>${keys.map((k) => `<th>${esc(k)}</th>`).join("")}</tr>
${body}</table>
</body></html>
`;
}
