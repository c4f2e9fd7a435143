// The browser page: inputs and options on the left, the frame on view, plots against field and
// the loop on the right. Analysis runs in Web Workers (the library's ordered pool); a change of
// any option starts a new run over every frame.
import { csvCell, fieldsFromTable, loopMetrics, VERSION, type Cell, type FieldValues, type FrameOptions, type LoopMetrics } from "../src/index";
import { filesOfDrop, filesOfInput, readInputs, tableColumns, type Inputs, type PickedFile } from "./inputs";
import { framesCsv, domainsCsv, manifestJson, reportHtml, type RunRecord, type Table } from "./outputs";
import { plotDefs, plotSvg, renderPlots, type PlotDef, type RenderedPlot } from "./plots";
import { startRun, ViewChannel } from "./pool";
import type { FrameJob, FrameReply, FrameViews, RgbaImage } from "./protocol";

const $ = <T extends HTMLElement>(id: string) => document.getElementById(id) as T;

const el = {
  files: $<HTMLInputElement>("files"),
  folder: $<HTMLInputElement>("folder"),
  inputsSummary: $("inputs-summary"),
  table: $<HTMLInputElement>("table"),
  column: $<HTMLSelectElement>("column"),
  fieldUnit: $<HTMLInputElement>("field-unit"),
  fieldSummary: $("field-summary"),
  thresholdMode: $<HTMLSelectElement>("threshold-mode"),
  thresholdLevel: $<HTMLInputElement>("threshold-level"),
  invert: $<HTMLInputElement>("invert"),
  grid: $<HTMLSelectElement>("grid"),
  connectivity: $<HTMLSelectElement>("connectivity"),
  boundary: $<HTMLSelectElement>("boundary"),
  pixelSize: $<HTMLInputElement>("pixel-size"),
  unit: $<HTMLInputElement>("unit"),
  minArea: $<HTMLInputElement>("min-area"),
  optionsError: $("options-error"),
  status: $("status"),
  problems: $("problems"),
  problemList: $("problem-list"),
  prev: $<HTMLButtonElement>("prev"),
  next: $<HTMLButtonElement>("next"),
  frameIndex: $<HTMLInputElement>("frame-index"),
  frameSlider: $<HTMLInputElement>("frame-slider"),
  frameWhere: $("frame-where"),
  frameCanvas: $<HTMLCanvasElement>("frame-canvas"),
  spectrumCanvas: $<HTMLCanvasElement>("spectrum-canvas"),
  spectrumCaption: $("spectrum-caption"),
  frameNumbers: $<HTMLTableElement>("frame-numbers"),
  frameAll: $<HTMLTableElement>("frame-all"),
  plots: $("plots"),
  loop: $<HTMLTableElement>("loop"),
  veil: $("drop-veil"),
  saveFrames: $<HTMLButtonElement>("save-frames"),
  saveDomains: $<HTMLButtonElement>("save-domains"),
  saveManifest: $<HTMLButtonElement>("save-manifest"),
  saveReport: $<HTMLButtonElement>("save-report"),
};

$("version").textContent = VERSION;

interface State {
  inputs: Inputs;
  table?: { name: string; text: string };
  fields?: FieldValues;
  replies: Array<FrameReply | undefined>;
  failed: Map<number, { where: string; message: string }>;
  run?: { cancel(): void; id: number; workers: number; started: number; seconds?: number; options: FrameOptions };
  runId: number;
  view: number;
  viewSeq: number;
  views?: FrameViews;
  plots: RenderedPlot[];
  plotDefs: PlotDef[];
  loop?: LoopMetrics;
}

const state: State = {
  inputs: { files: [], frames: [], skipped: 0 }, replies: [], failed: new Map(), runId: 0, view: 0, viewSeq: 0, plots: [], plotDefs: [],
};
const viewer = new ViewChannel();

// ---- Options ---------------------------------------------------------------------------------

function readOptions(): FrameOptions | string {
  const invalid = (input: HTMLInputElement, message: string) => { input.setAttribute("aria-invalid", "true"); return message; };
  for (const input of [el.thresholdLevel, el.pixelSize, el.unit, el.minArea]) input.removeAttribute("aria-invalid");
  const mode = el.thresholdMode.value;
  let threshold: FrameOptions["threshold"] = mode === "zero" ? "zero" : "otsu";
  if (mode === "level") {
    const level = Number(el.thresholdLevel.value);
    if (el.thresholdLevel.value.trim() === "" || !Number.isFinite(level)) return invalid(el.thresholdLevel, "Level: expected a number.");
    threshold = level;
  }
  const pixelSize = Number(el.pixelSize.value);
  if (!(pixelSize > 0) || !Number.isFinite(pixelSize)) return invalid(el.pixelSize, "Pixel size: expected a number above 0.");
  const unit = el.unit.value.trim();
  if (unit === "") return invalid(el.unit, "Length unit: expected a name such as nm or px.");
  const minDomainArea = Number(el.minArea.value || "0");
  if (!Number.isInteger(minDomainArea) || minDomainArea < 0) return invalid(el.minArea, "Smallest domain: expected a whole number of pixels, 0 or more.");
  const c = el.connectivity.value;
  return {
    threshold, invert: el.invert.checked, grid: el.grid.value === "hex" ? "hex" : "square",
    connectivity: c === "saddle" ? "saddle" : c === "4" ? 4 : 8,
    boundary: el.boundary.value as FrameOptions["boundary"], pixelSize, unit, minDomainArea,
  };
}

// ---- Inputs ----------------------------------------------------------------------------------

async function takeFiles(picked: PickedFile[]): Promise<void> {
  if (picked.length === 0) return;
  el.status.textContent = `Reading ${picked.length} file(s)…`;
  const inputs = await readInputs(picked);
  state.inputs = inputs;
  if (inputs.table) await takeTable(inputs.table.name, inputs.table.text);
  const bad = inputs.files.filter((f) => f.error);
  el.inputsSummary.textContent = `${inputs.frames.length} frame(s) in ${inputs.files.length - bad.length} file(s)` +
    (bad.length ? `; ${bad.length} file(s) could not be read` : "") +
    (inputs.skipped ? `; ${inputs.skipped} other file(s) skipped` : "") + ".";
  state.view = 0;
  const last = Math.max(0, inputs.frames.length - 1);
  for (const input of [el.frameIndex, el.frameSlider]) { input.max = String(last); input.value = "0"; input.disabled = inputs.frames.length === 0; }
  checkFields();
  startAnalysis();
}

async function takeTable(name: string, text: string): Promise<void> {
  state.table = { name, text };
  const columns = tableColumns(text);
  el.column.replaceChildren(...columns.map((c) => new Option(c, c)));
  el.column.disabled = columns.length === 0;
  // The first column whose name speaks of a field, else the first column.
  const guess = columns.find((c) => /field|^h\b|^b\b|\bmt\b|oe/i.test(c)) ?? columns[0];
  if (guess) el.column.value = guess;
  checkFields();
}

/** Reads the chosen field column; reports a bad table or a count that does not match. */
function checkFields(): void {
  state.fields = undefined;
  if (!state.table || !el.column.value) return;
  const frames = state.inputs.frames.length;
  const unit = el.fieldUnit.value.trim();
  try {
    const f = fieldsFromTable(state.table.text, el.column.value, { name: state.table.name, ...(unit ? { unit } : {}) });
    if (frames > 0 && f.values.length !== frames) {
      el.fieldSummary.textContent = `${state.table.name}: expected ${frames} field values for ${frames} frames, got ${f.values.length} from ${f.source}. Plots run against frame number.`;
      el.fieldSummary.className = "error";
      return;
    }
    state.fields = f;
    el.fieldSummary.textContent = `${f.values.length} field values from ${f.source}${f.unit ? ` in ${f.unit}` : ""}.`;
    el.fieldSummary.className = "note";
  } catch (error) {
    el.fieldSummary.textContent = (error as Error).message;
    el.fieldSummary.className = "error";
  }
}

let pending: ReturnType<typeof setTimeout> | undefined;

// ---- Runs ------------------------------------------------------------------------------------

function jobFor(index: number, options: FrameOptions, view?: FrameJob["view"]): Promise<FrameJob> | FrameJob {
  const ref = state.inputs.frames[index]!;
  const file = state.inputs.files[ref.file]!;
  const base = { index, where: ref.where, options, ...(view ? { view } : {}) };
  if (!file.source) {
    const bytes = file.bytes.slice();
    return { ...base, bytes, transfer: [bytes.buffer] };
  }
  return file.source.read(ref.k).then(
    (frame) => {
      const data = frame.data.slice();
      return { ...base, frame: { width: frame.width, height: frame.height, data }, transfer: [data.buffer as ArrayBuffer] };
    },
    (error: Error) => ({ ...base, fail: error.message }),
  );
}

function failureText(index: number, where: string, message: string): string {
  return `frame ${index} (${where}): ${message.startsWith(where) ? message.slice(where.length).replace(/^:\s*/, "") : message}`;
}

function startAnalysis(): void {
  clearTimeout(pending);
  state.run?.cancel();
  state.run = undefined;
  const options = readOptions();
  if (typeof options === "string") {
    el.optionsError.textContent = options;
    el.optionsError.hidden = false;
    return;
  }
  el.optionsError.hidden = true;
  const n = state.inputs.frames.length;
  state.replies = new Array(n);
  state.failed = new Map();
  renderProblems();
  updateSaves();
  if (n === 0) {
    el.status.textContent = state.inputs.files.length ? "None of the files holds a frame that can be read." : "Choose or drop frames to begin.";
    document.body.dataset.state = "done";
    return;
  }
  const id = ++state.runId;
  document.body.dataset.state = "running";
  async function* jobs(): AsyncGenerator<FrameJob> {
    for (let i = 0; i < n; i++) yield await jobFor(i, options as FrameOptions);
  }
  const run = startRun(jobs(), n);
  const started = performance.now();
  state.run = { cancel: run.cancel, id, workers: run.workers, started, options };
  el.status.textContent = `Analyzing ${n} frame(s) with ${run.workers} worker(s)…`;
  showFrame(state.view);
  void (async () => {
    let lastPaint = performance.now();
    let done = 0;
    for await (const o of run.outcomes) {
      if (state.runId !== id) return;
      done++;
      if (o.error) state.failed.set(o.index, { where: o.job.where, message: o.error.message });
      else state.replies[o.index] = o.result;
      if (o.error) renderProblems();
      if (performance.now() - lastPaint > 250) {
        lastPaint = performance.now();
        el.status.textContent = `Analyzed ${done} of ${n} frame(s) with ${run.workers} worker(s)…`;
      }
    }
    if (state.runId !== id) return;
    const seconds = (performance.now() - started) / 1000;
    state.run!.seconds = seconds;
    const failed = state.failed.size;
    el.status.textContent = `Analyzed ${n - failed} of ${n} frame(s) in ${seconds.toFixed(2)} s with ${run.workers} worker(s)` +
      (failed ? `; ${failed} could not be analyzed (listed below).` : ".");
    await refreshSummary();
    document.body.dataset.state = "done";
  })().catch((error: Error) => {
    if (state.runId !== id) return;
    el.status.textContent = `The run stopped: ${error.message}`;
    document.body.dataset.state = "done";
  });
}

function renderProblems(): void {
  const items: string[] = [];
  for (const f of state.inputs.files) if (f.error) items.push(f.error.startsWith(f.name) ? f.error : `${f.name}: ${f.error}`);
  for (const [index, f] of [...state.failed].sort((a, b) => a[0] - b[0])) items.push(failureText(index, f.where, f.message));
  el.problemList.replaceChildren(...items.map((t) => Object.assign(document.createElement("li"), { textContent: t })));
  el.problems.hidden = items.length === 0;
}

/** Analyzed frames in order, with their field (when the field table matches the frames). */
function table(): Table {
  const replies = state.replies.filter((r): r is FrameReply => r !== undefined);
  const t: Table = { replies };
  if (state.fields) {
    const unit = state.fields.unit.replace(/[^A-Za-z0-9µ]+/g, "");
    t.field = { name: `field${unit ? "_" + unit : ""}`, values: replies.map((r) => state.fields!.values[r.index]!) };
  }
  return t;
}

async function refreshSummary(): Promise<void> {
  const t = table();
  updateSaves();
  const rows = t.replies.map((r) => new Map<string, Cell>(r.row));
  const frames = t.replies.map((r) => r.index);
  const x = t.field ? t.field.values : frames;
  const options = state.run?.options ?? {};
  const width = plotWidth();
  plotsDrawnAt = width;
  state.plotDefs = plotDefs({ x, frames, rows, fieldUnit: t.field ? state.fields!.unit || "field" : "", unit: options.unit ?? "px" }, width);
  state.plots = await renderPlots(el.plots, state.plotDefs, frames, (f) => { setView(f); el.frameCanvas.focus(); }, state.plots);
  el.plots.dataset.drawn = "yes";
  renderLoop(t, rows);
}

let plotsDrawnAt = 0;

/** Two plots a row on a laptop, three or more on a wide monitor. */
function plotWidth(): number {
  const room = el.plots.clientWidth;
  const columns = Math.max(2, Math.floor(room / 400));
  return Math.max(280, Math.min(520, Math.floor(room / columns) - 70));
}

let redraw: ReturnType<typeof setTimeout> | undefined;
new ResizeObserver(() => {
  if (!state.plotDefs.length || plotWidth() === plotsDrawnAt || document.body.dataset.state !== "done") return;
  el.plots.dataset.drawn = "stale";
  clearTimeout(redraw);
  redraw = setTimeout(() => void refreshSummary(), 150);
}).observe(el.plots);

function renderLoop(t: Table, rows: Array<Map<string, Cell>>): void {
  state.loop = undefined;
  const body = el.loop.tBodies[0]!;
  if (!t.field) {
    body.replaceChildren(tr("Give a field table to get the loop metrics.", ""));
    return;
  }
  try {
    const m = rows.map((r) => Number(r.get("magnetization")));
    state.loop = loopMetrics(t.field.values, m);
  } catch (error) {
    body.replaceChildren(tr("Loop", (error as Error).message));
    return;
  }
  body.replaceChildren(...loopRows().map(([k, v, reason]) => {
    const row = tr(k, v);
    if (reason) row.cells[1]!.className = "reason";
    return row;
  }));
}

function loopRows(): Array<[string, string, boolean]> {
  const l = state.loop;
  if (!l) return [];
  const unit = state.fields?.unit ? ` (${state.fields.unit})` : "";
  const v = (o: { value: number | undefined; reason?: string }): [string, boolean] =>
    o.value === undefined ? [o.reason ?? "not computed", true] : [csvCell(o.value), false];
  const rows: Array<[string, { value: number | undefined; reason?: string }]> = [
    [`coercive field Hc${unit}`, l.coerciveField],
    [`Hc+ (ascending)${unit}`, l.ascending.coerciveField],
    [`Hc− (descending)${unit}`, l.descending.coerciveField],
    [`loop shift${unit}`, l.loopShift],
    ["remanence Mr", l.remanence],
    ["saturation Ms", l.saturation],
    ["squareness Mr/Ms", l.squareness],
    [`loop area${unit ? ` (m x${unit.slice(1)}` : ""}`, l.loopArea],
    [`nucleation field, descending${unit}`, l.descending.nucleationField],
    [`saturation field, descending${unit}`, l.descending.saturationField],
    [`nucleation field, ascending${unit}`, l.ascending.nucleationField],
    [`saturation field, ascending${unit}`, l.ascending.saturationField],
  ];
  return rows.map(([k, o]) => [k, ...v(o)]);
}

function tr(key: string, value: string): HTMLTableRowElement {
  const row = document.createElement("tr");
  const th = document.createElement("th");
  th.scope = "row";
  th.textContent = key;
  const td = document.createElement("td");
  td.textContent = value;
  row.append(th, td);
  return row;
}

// ---- The frame on view -----------------------------------------------------------------------

function setView(index: number): void {
  const n = state.inputs.frames.length;
  if (n === 0) return;
  const i = Math.max(0, Math.min(n - 1, Math.round(index)));
  el.frameIndex.value = el.frameSlider.value = String(i);
  if (i === state.view && state.views) return;
  state.view = i;
  showFrame(i);
}

const KEY_COLUMNS = ["magnetization", "up_domains", "down_domains", "up_euler", "down_euler", "up_bubbles", "up_stripes",
  "up_labyrinths", "down_bubbles", "down_stripes", "down_labyrinths", "threshold"];

function showFrame(index: number): void {
  const options = state.run?.options;
  const ref = state.inputs.frames[index];
  if (!options || !ref) return;
  const seq = ++state.viewSeq;
  el.frameWhere.textContent = ref.where;
  document.body.dataset.view = "loading";
  const w = firstSide(index);
  const scale = Math.max(1, Math.min(4, Math.floor(768 / Math.max(1, w))));
  void Promise.resolve(jobFor(index, options, { overlayScale: scale }))
    .then((job) => viewer.request(job))
    .then((reply) => {
      if (seq !== state.viewSeq) return;
      state.views = reply.views;
      drawViews();
      const row = new Map(reply.row);
      const u = (options.unit ?? "px").replace(/[^A-Za-z0-9µ]+/g, "");
      const keys = [...KEY_COLUMNS, `wall_length_density_per_${u}`, `period_${u}`];
      const field = state.fields ? [[`field${state.fields.unit ? ` (${state.fields.unit})` : ""}`, csvCell(state.fields.values[index]!)] as [string, string]] : [];
      el.frameNumbers.tBodies[0]!.replaceChildren(...[...field, ...keys.filter((k) => row.has(k)).map((k) => [k, csvCell(row.get(k)!)] as [string, string])]
        .map(([k, v]) => { const r = tr(k, v); r.dataset.column = k; return r; }));
      el.frameAll.tBodies[0]!.replaceChildren(...reply.row.map(([k, v]) => { const r = tr(k, csvCell(v)); r.dataset.column = k; return r; }));
      document.body.dataset.view = "ready";
    }, (error: Error) => {
      if (seq !== state.viewSeq) return;
      state.views = undefined;
      clearCanvas(el.frameCanvas, `frame ${index} could not be analyzed`);
      clearCanvas(el.spectrumCanvas, "no spectrum");
      el.frameNumbers.tBodies[0]!.replaceChildren(tr("could not analyze", failureText(index, ref.where, error.message)));
      el.frameAll.tBodies[0]!.replaceChildren();
      document.body.dataset.view = "failed";
    });
}

/** The frame's width if known from an earlier reply (for the overlay magnification). */
function firstSide(index: number): number {
  const r = state.replies[index] ?? state.replies.find((x) => x !== undefined);
  return r ? Math.max(r.width, r.height) : 256;
}

function drawViews(): void {
  const v = state.views;
  if (!v) return;
  const raw = (document.querySelector("input[name=show]:checked") as HTMLInputElement | null)?.value === "raw";
  const img = raw ? v.raw : v.overlay;
  drawImage(el.frameCanvas, img);
  const ref = state.inputs.frames[state.view];
  el.frameCanvas.setAttribute("aria-label", `${raw ? "Frame" : "Domains by kind with skeleton"}: frame ${state.view}${ref ? `, ${ref.where}` : ""}, ${v.raw.width} x ${v.raw.height} pixels`);
  if (v.spectrum) {
    drawImage(el.spectrumCanvas, v.spectrum);
    el.spectrumCanvas.setAttribute("aria-label", `Power spectrum of frame ${state.view}`);
    el.spectrumCaption.textContent = "Power spectrum (log scale, centred); circle at the ring q*.";
  } else {
    clearCanvas(el.spectrumCanvas, "no spectrum");
    el.spectrumCaption.textContent = `No spectrum: ${v.spectrumNote ?? "the frame is too small or uniform"}.`;
  }
}

function drawImage(canvas: HTMLCanvasElement, img: RgbaImage): void {
  canvas.width = img.width;
  canvas.height = img.height;
  canvas.getContext("2d")!.putImageData(new ImageData(new Uint8ClampedArray(img.rgba), img.width, img.height), 0, 0);
}

function clearCanvas(canvas: HTMLCanvasElement, label: string): void {
  canvas.width = canvas.height = 1;
  canvas.setAttribute("aria-label", label);
}

// ---- Saving ----------------------------------------------------------------------------------

function updateSaves(): void {
  const any = state.replies.some((r) => r !== undefined);
  for (const b of [el.saveFrames, el.saveDomains, el.saveReport]) b.disabled = !any;
  el.saveManifest.disabled = state.inputs.files.length === 0;
}

function save(name: string, text: string, type: string): void {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const a = document.createElement("a");
  a.href = url;
  a.download = name;
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

function record(): RunRecord {
  const f = state.fields;
  return {
    options: state.run?.options ?? {},
    inputs: state.inputs.files.map((x) => ({ name: x.name, bytes: x.size, frames: x.count, ...(x.error ? { error: x.error } : {}) })),
    field: f ? { source: f.source, unit: f.unit, values: f.values.length } : null,
    frames: state.inputs.frames.length,
    failed: [...state.failed].sort((a, b) => a[0] - b[0]).map(([frame, x]) => ({ frame, where: x.where, message: x.message })),
    workers: state.run?.workers ?? 0,
    seconds: state.run?.seconds ?? 0,
  };
}

el.saveFrames.addEventListener("click", () => save("frames.csv", framesCsv(table()), "text/csv"));
el.saveDomains.addEventListener("click", () => save("domains.csv", domainsCsv(table(), state.run?.options.unit ?? "px"), "text/csv"));
el.saveManifest.addEventListener("click", () => save("run.json", manifestJson(record()), "application/json"));
el.saveReport.addEventListener("click", () => {
  void (async () => {
    const plots = await Promise.all(state.plotDefs.map((d) => plotSvg(d)));
    const ref = state.inputs.frames[state.view];
    const frameImage = state.views && ref
      ? { caption: `Frame ${state.view} (${ref.where}), domains by kind`, dataUrl: canvasUrl(state.views.overlay) } : undefined;
    save("report.html", reportHtml({
      record: record(), table: table(), plots, loopRows: loopRows().map(([k, v]) => [k, v]), ...(frameImage ? { frameImage } : {}),
    }), "text/html");
  })();
});

function canvasUrl(img: RgbaImage): string {
  const c = document.createElement("canvas");
  drawImage(c, img);
  return c.toDataURL("image/png");
}

// ---- Wiring ----------------------------------------------------------------------------------

el.files.addEventListener("change", () => void takeFiles(filesOfInput(el.files)));
el.folder.addEventListener("change", () => void takeFiles(filesOfInput(el.folder)));
el.table.addEventListener("change", () => {
  const file = el.table.files?.[0];
  if (!file) return;
  void file.text().then(async (text) => { await takeTable(file.name, text); if (state.run?.seconds !== undefined) await refreshSummary(); });
});
for (const control of [el.column, el.fieldUnit]) {
  control.addEventListener("change", () => { checkFields(); if (state.run?.seconds !== undefined) void refreshSummary(); showFrame(state.view); });
}

/** A new run only when the options differ from those of the current run (a blur fires change too). */
const changed = () => {
  const o = readOptions();
  return typeof o === "string" || !state.run || JSON.stringify(o) !== JSON.stringify(state.run.options);
};
const rerun = () => { clearTimeout(pending); pending = setTimeout(() => { if (changed()) startAnalysis(); }, 250); };
el.thresholdMode.addEventListener("change", () => { el.thresholdLevel.disabled = el.thresholdMode.value !== "level"; startAnalysis(); });
for (const control of [el.invert, el.grid, el.connectivity, el.boundary]) control.addEventListener("change", startAnalysis);
// Six-connected phases on a hexagonal lattice: the connectivity choice does not apply there.
el.grid.addEventListener("change", () => { el.connectivity.disabled = el.grid.value === "hex"; });
for (const control of [el.thresholdLevel, el.pixelSize, el.unit, el.minArea]) {
  control.addEventListener("input", rerun);
  control.addEventListener("change", () => { clearTimeout(pending); if (changed()) startAnalysis(); });
}
for (const radio of document.querySelectorAll<HTMLInputElement>("input[name=show]")) radio.addEventListener("change", drawViews);
el.frameIndex.addEventListener("change", () => setView(Number(el.frameIndex.value)));
el.frameSlider.addEventListener("input", () => setView(Number(el.frameSlider.value)));
el.prev.addEventListener("click", () => setView(state.view - 1));
el.next.addEventListener("click", () => setView(state.view + 1));
el.frameCanvas.tabIndex = 0;
el.frameCanvas.addEventListener("keydown", (e) => {
  if (e.key === "ArrowLeft") { setView(state.view - 1); e.preventDefault(); }
  if (e.key === "ArrowRight") { setView(state.view + 1); e.preventDefault(); }
});

// Drops anywhere on the page; a veil shows while files are dragged over it.
let dragDepth = 0;
window.addEventListener("dragenter", (e) => { if (e.dataTransfer?.types.includes("Files")) { dragDepth++; el.veil.hidden = false; e.preventDefault(); } });
window.addEventListener("dragleave", () => { dragDepth = Math.max(0, dragDepth - 1); if (dragDepth === 0) el.veil.hidden = true; });
window.addEventListener("dragover", (e) => e.preventDefault());
window.addEventListener("drop", (e) => {
  e.preventDefault();
  dragDepth = 0;
  el.veil.hidden = true;
  if (e.dataTransfer) void filesOfDrop(e.dataTransfer).then(takeFiles);
});

updateSaves();
