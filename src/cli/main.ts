// The domtopo command line: a thin front over the public API.
import { parseArgs, type ParseArgsConfig } from "node:util";
import { readFileSync } from "node:fs";
import { join, resolve, basename } from "node:path";
import { createAnalyzer, type FrameAnalyzer } from "../topology/analyze";
import type { FrameOptions } from "../topology/options";
import { frameRow, domainHeader, domainRows, csvLine, type Cell } from "../topology/rows";
import { demoSweep } from "../demo/sweep";
import { AtomicWriter, writeFileAtomic } from "../node/atomic";
import { Progress } from "./progress";

import { encodePng, encodeRgbaPng } from "../io/png";
import type { PreprocessOptions } from "../prep/preprocess";
import { listFrameFiles, openFrameFiles } from "../io/node-source";
import { fieldsFromList, fieldsFromNames, fieldsFromSweep, fieldsFromTable, type FieldValues } from "../io/fields";
import { runAnalysis } from "../node/run";
import { AnalyzerCache, runFrameJob } from "../sequence/job";
import { resolveFrameOptions } from "../topology/options";
import type { Frame } from "../types";
import { VERSION } from "../version";
import { UsageError } from "./usage";
import { runDemoLoop } from "./demo-loop";
import { DemoSpectra } from "./demo-spectra";
import { runLoop, runForc, commitAll, LOOP_HELP, FORC_HELP } from "./loop";
import { buildReport, runReport, REPORT_HELP } from "./report";
import { fmt } from "./loop-tables";
import { runMerge, MERGE_HELP } from "./merge";
import { parseShard, shardFolderName, shardFromSlurm, shardRange, type ShardSpec } from "../node/shard";

/** Exit codes: 0 done, 1 the run failed, 2 bad command line, 3 done but some frames failed. */
export const EXIT = { ok: 0, failed: 1, usage: 2, someFramesFailed: 3 } as const;


const FRAME_OPTIONS_HELP = `Frame options:
  --threshold L         level between down and up: a number (sample units), otsu, or zero
                        (default: otsu for analyze, halfway between saturated levels for demo)
  --invert              dark samples are up (default: bright = up)
  --connectivity C      connectivity of the up phase: 8, 4 or saddle (down gets the other) [8]
  --boundary B          open, periodic, periodic-x or periodic-y [open]
  --grid G              square, or hex: a hexagonal lattice in offset rows (odd rows shifted
                        right by half a site, rows sqrt(3)/2 apart; --pixel-size is the lattice
                        constant; both phases six-connected, --connectivity unused) [square]
  --min-area N          absorb domains smaller than N pixels into their surroundings [0]
  --pixel-size S        length of one pixel, in --unit [1]
  --unit U              length unit of the tables [px]`;

const HELP: Record<string, string> = {
  main: `domtopo ${VERSION}: topology of magnetic domain patterns (bubbles, stripes, labyrinths)

Usage: domtopo <command> [options]

Commands:
  demo                  generate the built-in synthetic field sweep and analyze every frame
  analyze <files...>    analyze frames: PNG, APNG, TIFF stacks, .npy, folders (one row per frame)
  loop <frames.csv>     loop metrics of a per-frame table (coercive field, remanence, area, ...)
  forc <frames.csv>     FORC distribution of reversal curves in a per-frame table
  report <run folder>   one self-contained HTML report of a run folder
  merge <shards...>     merge the shards of one analyze --shard run into one run's tables
  help [command]        show help for a command

Run 'domtopo <command> --help' for the options of a command.
Exit codes: 0 done, 1 the run failed (unreadable input, analysis error), 2 bad command line,
3 (analyze) the run finished but some frames failed.`,
  demo: `Usage: domtopo demo [options]

Generates an invented field sweep (a Gaussian random field thresholded at levels that follow the
applied field: bubbles of one phase, a maze, bubbles of the other), writes the frames as PNG and
analyzes them.

Options:
  --out DIR             output folder [domtopo-demo]
  --frames N            number of frames [41]
  --size N              frame side in pixels, a power of two [256]
  --pattern P           maze or stripes [maze]
  --seed N              seed of the pattern and the noise [3]
  --grid G              square, or hex: both sweeps sampled at the sites of a hexagonal lattice
                        (offset rows, see the frame options) and analyzed as such [square]
  --quiet               no progress and no summary
  -h, --help            this help

Writes DIR/frames/*.png, DIR/fields.csv (field per frame), DIR/frames.csv (one row per frame),
DIR/domains.csv (one row per domain and frame), DIR/run.json (scenario and options), overlays of
every few frames (DIR/overlays/*.png), and the radial spectrum S(q) of the maze nearest zero
field and of a bubble frame (DIR/spectra.csv: frame, field, q, S) with their log-scaled power
spectra, ring marked (DIR/spectra/frame-NNNN.png).

Then a second, hysteretic synthetic sweep (an invented lattice of square hysterons on a
Gaussian random field, 128 x 128 px): a major loop and first-order reversal curves, analyzed
frame by frame into DIR/loop/frames.csv (segment, reversal field, field, per-frame columns), with
DIR/loop/loop.json (loop metrics, FORC distribution at SF 2, excursions from the major loop,
up domains and Euler number on the (Ha, Hb) grid) and the same as CSV (loop-metrics.csv,
forc.csv, excursions.csv, topology-map.csv). Last, DIR/report.html shows it all.

${FRAME_OPTIONS_HELP}`,
  loop: LOOP_HELP,
  forc: FORC_HELP,
  report: REPORT_HELP,
  merge: MERGE_HELP,
  analyze: `Usage: domtopo analyze <frames...> [options]

Analyzes every frame of the inputs, in order: PNG files (8/16-bit grey, colour reduced to luma),
APNG movies, multi-page TIFF stacks (8/16/32-bit, float), NumPy .npy arrays (2-D or frames x
height x width), folders of such files (natural order: frame2 before frame10) and patterns.

Options:
  --out DIR             write DIR/frames.csv, DIR/frames.ndjson, DIR/domains.csv (with
                        --domains) and DIR/run.json (inputs with sizes and SHA-256, options,
                        version, timings); without --out the per-frame table goes to stdout
  --domains             also write the per-domain table
  --workers N           worker threads [the number of cores]
  --resume              continue an interrupted run in DIR from its last checkpoint
  --strict              stop at the first frame that fails (default: report it and go on)
  --spectrum S          spectrum of the phase map (binary), of the samples (grey), or off [binary]
  --skeleton S          skeletons, ends, junctions and kinds: on or off [on]
  --track               link domains between consecutive frames: nucleated, annihilated, split
                        and merged counts per frame, DIR/tracks.csv with lifetimes and the
                        field at which each domain ended
  --max-displacement P  with --track: link a domain without overlap to the nearest one of its
                        phase within P pixels [0: overlap only]
  --overlays N          write DIR/overlays/frame-NNNNN.png (kinds, skeleton, ends, junctions)
                        for every N-th frame
  --spectra N           write DIR/spectra/frame-NNNNN.png (log power spectrum, centred, the ring
                        at q* marked) for every N-th frame
  --shard K/N           analyze only shard K of N (K from 0 to N-1): N contiguous frame ranges
                        as equal as possible; writes DIR/shard-K-of-N/ (tables, run.json with the
                        range, with --track the cut's frames and tracker); 'domtopo merge' joins
                        the shards. N may not exceed the frames
  --shard slurm         the shard of this Slurm array task: K = SLURM_ARRAY_TASK_ID -
                        SLURM_ARRAY_TASK_MIN, N = SLURM_ARRAY_TASK_COUNT (sbatch --array=0-3)
  --quiet               no progress and no summary
  --json                print the run summary as JSON on stdout
  -h, --help            this help

Preprocessing (in this order; recorded in run.json):
  --crop x,y,w,h        keep this rectangle
  --background FILE     divide by (or subtract) this reference frame, e.g. one at saturation
  --background-mode M   divide or subtract [divide]
  --flatten F           highpass:SIGMA (subtract a Gaussian blur; SIGMA several periods),
                        plane, poly:ORDER (least-squares surface) or lines (row medians)
  --smooth SIGMA        Gaussian smoothing, SIGMA in pixels

Field per frame (one of):
  --field-table F --field-column NAME   a column of a CSV/TSV file (header row)
  --fields a,b,c                        a list
  --sweep start:stop:step[,...]         segments in sequence, e.g. -40:40:1,40:-40:1
  --field-from-names REGEX              a capture group on the file names, e.g. "H=(-?[0-9.]+)mT"
  --field-unit U                        unit of the field values (a table header "H (mT)" gives it)

Exit codes: 0 every frame analyzed; 1 the run failed; 2 bad command line; 3 the run finished
but some frames failed (they are listed in run.json and on stderr).

${FRAME_OPTIONS_HELP}`,
};

const FRAME_FLAGS = {
  threshold: { type: "string" },
  invert: { type: "boolean" },
  connectivity: { type: "string" },
  boundary: { type: "string" },
  grid: { type: "string" },
  "min-area": { type: "string" },
  "pixel-size": { type: "string" },
  unit: { type: "string" },
  quiet: { type: "boolean" },
  help: { type: "boolean", short: "h" },
} as const;

type Values = Record<string, string | boolean | undefined>;

function parse(command: string, argv: string[], extra: ParseArgsConfig["options"]): { values: Values; positionals: string[] } {
  try {
    const r = parseArgs({ args: argv, options: { ...FRAME_FLAGS, ...extra }, allowPositionals: true, strict: true });
    return { values: r.values as Values, positionals: r.positionals };
  } catch (err) {
    throw new UsageError(`${command}: ${(err as Error).message}`);
  }
}

function number(flag: string, text: string | undefined): number | undefined {
  if (text === undefined) return undefined;
  const v = Number(text);
  if (text.trim() === "" || !Number.isFinite(v)) {
    throw new UsageError(`--${flag}: expected a number, got ${JSON.stringify(text)}`);
  }
  return v;
}

function frameOptions(values: Record<string, unknown>, defaults: FrameOptions): FrameOptions {
  const o: FrameOptions = { ...defaults };
  const t = values.threshold as string | undefined;
  if (t !== undefined) o.threshold = t === "otsu" || t === "zero" ? t : number("threshold", t);
  if (values.invert) o.invert = true;
  const c = values.connectivity as string | undefined;
  if (c !== undefined) {
    if (c !== "8" && c !== "4" && c !== "saddle") {
      throw new UsageError(`--connectivity: expected 8, 4 or saddle, got ${JSON.stringify(c)}`);
    }
    o.connectivity = c === "saddle" ? "saddle" : (Number(c) as 8 | 4);
  }
  if (values.boundary !== undefined) o.boundary = values.boundary as FrameOptions["boundary"];
  const g = values.grid as string | undefined;
  if (g !== undefined) {
    if (g !== "square" && g !== "hex") throw new UsageError(`--grid: expected square or hex, got ${JSON.stringify(g)}`);
    o.grid = g;
  }
  const m = number("min-area", values["min-area"] as string | undefined);
  if (m !== undefined) o.minDomainArea = m;
  const s = number("pixel-size", values["pixel-size"] as string | undefined);
  if (s !== undefined) o.pixelSize = s;
  if (values.unit !== undefined) o.unit = values.unit as string;
  return o;
}

interface Tables {
  frames: AtomicWriter | undefined;
  domains: AtomicWriter | undefined;
  stdout: boolean;
  headerDone: boolean;
}

function writeRow(t: Tables, lead: Array<[string, Cell]>, analyzer: FrameAnalyzer, frame: Frame, options: FrameOptions, where: string) {
  const r = analyzer.analyze(frame, options, where);
  const row = [...lead, ...frameRow(r)];
  const text = (t.headerDone ? "" : csvLine(row.map(([k]) => k))) + csvLine(row.map(([, v]) => v));
  t.headerDone = true;
  if (t.frames) t.frames.write(text);
  else if (t.stdout) process.stdout.write(text);
  if (t.domains) {
    const leadCells = lead.map(([, v]) => v);
    let out = "";
    for (const d of domainRows(r)) out += csvLine([...leadCells, ...d]);
    t.domains.write(out);
  }
  return r;
}

async function runDemo(argv: string[]): Promise<number> {
  const { values } = parse("demo", argv, {
    out: { type: "string" }, frames: { type: "string" }, size: { type: "string" },
    pattern: { type: "string" }, seed: { type: "string" },
  });
  if (values.help) { process.stdout.write(HELP.demo + "\n"); return EXIT.ok; }
  const out = resolve((values.out as string | undefined) ?? "domtopo-demo");
  const pattern = (values.pattern as string | undefined) ?? "maze";
  if (pattern !== "maze" && pattern !== "stripes") {
    throw new UsageError(`--pattern: expected maze or stripes, got ${JSON.stringify(pattern)}`);
  }
  const grid = values.grid as string | undefined;
  if (grid !== undefined && grid !== "square" && grid !== "hex") throw new UsageError(`--grid: expected square or hex, got ${JSON.stringify(grid)}`);
  const sweep = demoSweep({
    grid: grid === "hex" ? "hex" : "square",
    frames: number("frames", values.frames as string | undefined),
    size: number("size", values.size as string | undefined),
    seed: number("seed", values.seed as string | undefined),
    pattern,
  });
  const options = frameOptions(values, {
    threshold: sweep.threshold, pixelSize: sweep.pixelSize, unit: sweep.unit, minDomainArea: 4,
  });
  const quiet = Boolean(values.quiet);
  const fieldCol = `field_${sweep.fieldUnit}`;
  const tables: Tables = {
    frames: new AtomicWriter(join(out, "frames.csv")),
    domains: new AtomicWriter(join(out, "domains.csv")),
    stdout: false, headerDone: false,
  };
  const fieldsCsv = new AtomicWriter(join(out, "fields.csv"));
  const analyzer = createAnalyzer(sweep.width, sweep.height);
  const spectra = new DemoSpectra(sweep.width, sweep.height, sweep.fields, fieldCol, sweep.unit, sweep.grid);
  const progress = new Progress(sweep.fields.length, "demo", process.stderr, !quiet);
  const started = performance.now();
  let analysisMs = 0;
  const picks: Array<{ field: number; m: number; up: number; down: number; eu: number; ed: number }> = [];
  try {
    fieldsCsv.write(`frame,file,${fieldCol}\n`);
    tables.domains!.write(csvLine(["frame", fieldCol, ...domainHeader(sweep.unit, options.skeleton !== "off")]));
    for (let k = 0; k < sweep.fields.length; k++) {
      const frame = sweep.frame(k);
      const name = `frame-${String(k).padStart(4, "0")}.png`;
      writeFileAtomic(join(out, "frames", name), encodePng(frame));
      fieldsCsv.write(csvLine([k, name, sweep.fields[k]!]));
      const t0 = performance.now();
      const r = writeRow(tables, [["frame", k], [fieldCol, sweep.fields[k]!]], analyzer, frame, options, `demo frame ${k}`);
      analysisMs += performance.now() - t0;
      spectra.keep(k, sweep.fields[k]!, analyzer.phase().slice(), r.spectrum);
      picks.push({ field: sweep.fields[k]!, m: r.magnetization, up: r.up.domains, down: r.down.domains, eu: r.up.euler, ed: r.down.euler });
      const every = Math.max(1, Math.round((sweep.fields.length - 1) / 8));
      if (r.skeleton && (k % every === 0 || k === sweep.fields.length - 1)) {
        const img = analyzer.overlay({ scale: sweep.grid === "hex" ? 4 : 2 });
        writeFileAtomic(join(out, "overlays", `frame-${String(k).padStart(4, "0")}.png`), encodeRgbaPng(img.width, img.height, img.rgba));
      }
      progress.tick(k + 1);
    }
    progress.done();
    tables.frames!.commit();
    tables.domains!.commit();
    fieldsCsv.commit();
    commitAll(spectra.files(out));
  } catch (err) {
    tables.frames!.abort(); tables.domains!.abort(); fieldsCsv.abort();
    throw err;
  } finally {
    analyzer.dispose();
    spectra.dispose();
  }
  writeFileAtomic(join(out, "run.json"), JSON.stringify({
    tool: "domtopo", version: VERSION, command: "demo", scenario: sweep.scenario,
    frames: sweep.fields.length, width: sweep.width, height: sweep.height,
    fieldUnit: sweep.fieldUnit, pattern, options,
  }, null, 2) + "\n");
  if (!quiet) {
    const total = (performance.now() - started) / 1000;
    const lines = [
      sweep.scenario,
      "",
      `${sweep.fields.length} frames of ${sweep.width} x ${sweep.height} px analyzed in ${(analysisMs / 1000).toFixed(2)} s ` +
        `(${((1000 * sweep.fields.length) / analysisMs).toFixed(0)} frames/s; ${total.toFixed(1)} s with PNG writing)`,
      "",
      `  ${fieldCol.padStart(9)}  magnetization  up domains  down domains  Euler up  Euler down`,
    ];
    const step = Math.max(1, Math.round((picks.length - 1) / 8));
    for (let k = 0; k < picks.length; k += step) {
      const p = picks[k]!;
      lines.push(`  ${p.field.toFixed(1).padStart(9)}  ${p.m.toFixed(3).padStart(13)}  ${String(p.up).padStart(10)}  ` +
        `${String(p.down).padStart(12)}  ${String(p.eu).padStart(8)}  ${String(p.ed).padStart(10)}`);
    }
    lines.push("", `Wrote ${join(out, "frames.csv")}, domains.csv, fields.csv, run.json, frames/*.png, overlays/*.png, ` +
      `spectra.csv and spectra/*.png (S(q) and spectrum of frame${spectra.frames.length === 1 ? "" : "s"} ${spectra.frames.join(", ")})`);
    process.stdout.write(lines.join("\n") + "\n");
  }
  // The hysteretic sweep (major loop and reversal curves), then the report of the whole folder.
  const loop = runDemoLoop(out, options, { grid: sweep.grid });
  const html = await buildReport(out);
  writeFileAtomic(join(out, "report.html"), html);
  if (!quiet) {
    const v = (o: { value?: number }) => (o.value === undefined ? "-" : fmt(o.value));
    const lm = loop.metrics;
    process.stdout.write([
      "",
      loop.scenario,
      "",
      `${loop.frames} frames (major loop and ${loop.reversalCurves} reversal curves) analyzed in ${(loop.analysisMs / 1000).toFixed(2)} s: ` +
        `Hc = ${v(lm.coerciveField)} mT, Mr = ${v(lm.remanence)}, Ms = ${v(lm.saturation)}, loop area = ${v(lm.loopArea)} mT, ` +
        `FORC (SF ${loop.forc.options.smoothingFactor}) at ${loop.forc.counts.ok} points`,
      `Wrote ${join(out, "loop", "frames.csv")}, loop.json, loop-metrics.csv, forc.csv, excursions.csv, topology-map.csv`,
      `Report: ${join(out, "report.html")} (synthetic data)`,
    ].join("\n") + "\n");
  }
  return EXIT.ok;
}

function fieldValues(values: Values, files: string[]): FieldValues | undefined {
  const unit = values["field-unit"] as string | undefined;
  const given = ["field-table", "fields", "sweep", "field-from-names"].filter((k) => values[k] !== undefined);
  if (given.length > 1) throw new UsageError(`give the field one way, not ${given.map((g) => "--" + g).join(" and ")}`);
  const frames = openFrameFiles(files).count;
  if (values["field-table"] !== undefined) {
    const file = values["field-table"] as string;
    const column = values["field-column"] as string | undefined;
    if (!column) throw new UsageError("--field-table needs --field-column NAME");
    let text: string;
    try { text = readFileSync(file, "utf8"); } catch (err) {
      throw new Error(`${file}: cannot read (${(err as NodeJS.ErrnoException).code ?? (err as Error).message})`);
    }
    return fieldsFromTable(text, column, { name: file, frames, ...(unit ? { unit } : {}) });
  }
  if (values.fields !== undefined) {
    const list = (values.fields as string).split(",").map((t, i) => {
      const v = Number(t);
      if (t.trim() === "" || !Number.isFinite(v)) throw new UsageError(`--fields: value ${i} is ${JSON.stringify(t)}, not a number`);
      return v;
    });
    return fieldsFromList(list, { unit: unit ?? "", frames, source: "--fields" });
  }
  if (values.sweep !== undefined) {
    const segments = (values.sweep as string).split(",").map((seg) => {
      const parts = seg.split(":").map(Number);
      if (parts.length !== 3 || !parts.every(Number.isFinite)) {
        throw new UsageError(`--sweep: expected start:stop:step segments separated by commas, got ${JSON.stringify(seg)}`);
      }
      return { start: parts[0]!, stop: parts[1]!, step: parts[2]! };
    });
    return fieldsFromSweep(segments, { unit: unit ?? "", frames });
  }
  if (values["field-from-names"] !== undefined) {
    const names = files.length === frames ? files.map((f) => basename(f)) : undefined;
    if (!names) throw new UsageError("--field-from-names needs one file per frame (not stacks)");
    return fieldsFromNames(names, values["field-from-names"] as string, { unit: unit ?? "", frames });
  }
  return undefined;
}

async function runAnalyze(argv: string[]): Promise<number> {
  const { values, positionals } = parse("analyze", argv, {
    out: { type: "string" }, domains: { type: "boolean" }, workers: { type: "string" },
    resume: { type: "boolean" }, strict: { type: "boolean" }, json: { type: "boolean" },
    "field-table": { type: "string" }, "field-column": { type: "string" }, fields: { type: "string" },
    sweep: { type: "string" }, "field-from-names": { type: "string" }, "field-unit": { type: "string" },
    spectrum: { type: "string" }, skeleton: { type: "string" }, track: { type: "boolean" },
    "max-displacement": { type: "string" }, overlays: { type: "string" }, spectra: { type: "string" }, crop: { type: "string" },
    background: { type: "string" }, "background-mode": { type: "string" }, flatten: { type: "string" },
    smooth: { type: "string" }, shard: { type: "string" },
  });
  if (values.help) { process.stdout.write(HELP.analyze + "\n"); return EXIT.ok; }
  if (positionals.length === 0) throw new UsageError("analyze: expected at least one frame file, folder or pattern (see domtopo analyze --help)");
  const options = frameOptions(values, {});
  const spectrum = values.spectrum as string | undefined;
  if (spectrum !== undefined) {
    if (spectrum !== "off" && spectrum !== "binary" && spectrum !== "grey") {
      throw new UsageError(`--spectrum: expected off, binary or grey, got ${JSON.stringify(spectrum)}`);
    }
    options.spectrum = spectrum === "off" ? "off" : { signal: spectrum };
  }
  const skeleton = values.skeleton as string | undefined;
  if (skeleton !== undefined) {
    if (skeleton !== "off" && skeleton !== "on") throw new UsageError(`--skeleton: expected on or off, got ${JSON.stringify(skeleton)}`);
    if (skeleton === "off") options.skeleton = "off";
  }
  resolveFrameOptions(options); // option errors before any file is touched
  const preprocess = preprocessOptions(values);
  const backgroundFile = values.background as string | undefined;
  const overlaysEvery = number("overlays", values.overlays as string | undefined);
  if (overlaysEvery !== undefined && (!Number.isInteger(overlaysEvery) || overlaysEvery < 1)) {
    throw new UsageError(`--overlays: expected a whole number >= 1 (every N-th frame), got ${overlaysEvery}`);
  }
  if (overlaysEvery !== undefined && options.skeleton === "off") throw new UsageError("--overlays needs the skeleton on");
  const spectraEvery = number("spectra", values.spectra as string | undefined);
  if (spectraEvery !== undefined && (!Number.isInteger(spectraEvery) || spectraEvery < 1)) {
    throw new UsageError(`--spectra: expected a whole number >= 1 (every N-th frame), got ${spectraEvery}`);
  }
  if (spectraEvery !== undefined && options.spectrum === "off") throw new UsageError("--spectra needs the spectrum on");
  const maxDisplacement = number("max-displacement", values["max-displacement"] as string | undefined);
  if (maxDisplacement !== undefined && !values.track) throw new UsageError("--max-displacement goes with --track");
  const quiet = Boolean(values.quiet);
  const files = listFrameFiles(positionals);
  const fields = fieldValues(values, files);
  const workers = number("workers", values.workers as string | undefined);
  if (workers !== undefined && (!Number.isInteger(workers) || workers < 1)) {
    throw new UsageError(`--workers: expected a whole number >= 1, got ${workers}`);
  }
  const outDir = values.out as string | undefined;
  if (!outDir) {
    for (const flag of ["domains", "resume", "workers", "track", "overlays", "spectra", "shard"]) {
      if (values[flag] !== undefined) throw new UsageError(`--${flag} needs --out DIR`);
    }
    return analyzeToStdout(files, options, fields, quiet, preprocess, backgroundFile);
  }
  const frameCount = openFrameFiles(files).count;
  const shard = shardOption(values.shard as string | undefined, frameCount);
  const runDir = shard ? join(outDir, shardFolderName(shard)) : outDir;
  const progress = new Progress(shard ? shard.range.end - shard.range.start : frameCount, "analyze", process.stderr, !quiet);
  const summary = await runAnalysis({
    inputs: files, out: runDir, ...(shard ? { shard: { index: shard.index, count: shard.count }, range: shard.range } : {}),
    options: { frame: options, domains: Boolean(values.domains), ...(preprocess ? { preprocess } : {}) }, fields,
    ...(backgroundFile ? { backgroundFile } : {}),
    ...(values.track ? { tracking: { ...(maxDisplacement !== undefined ? { maxDisplacement } : {}) } } : {}),
    ...(overlaysEvery !== undefined ? { overlay: { every: overlaysEvery, scale: options.grid === "hex" ? 4 : 2 } } : {}),
    ...(spectraEvery !== undefined ? { spectra: { every: spectraEvery } } : {}),
    workers, resume: Boolean(values.resume), strict: Boolean(values.strict),
    onProgress: (d) => progress.tick(d),
    onFrameError: (_i, _w, message) => { if (!quiet) process.stderr.write(`\ndomtopo: skipped ${message}\n`); },
  });
  progress.done();
  if (values.json) process.stdout.write(JSON.stringify(summary) + "\n");
  else if (!quiet) {
    process.stderr.write(`Analyzed ${summary.analyzed} of ${summary.frames} frames in ${summary.seconds.toFixed(1)} s ` +
      `(${summary.framesPerSecond.toFixed(1)} frames/s, ${summary.workers} worker${summary.workers === 1 ? "" : "s"})` +
      `${summary.resumedAt && summary.resumedAt !== summary.range.start ? `, resumed at frame ${summary.resumedAt}` : ""}` +
      `${shard ? ` (shard ${shard.index} of ${shard.count}: frames ${shard.range.start} to ${shard.range.end - 1})` : ""}; tables in ${resolve(runDir)}\n`);
  }
  return summary.failed.length > 0 ? EXIT.someFramesFailed : EXIT.ok;
}

/** The shard of `--shard K/N` or `--shard slurm`, with its frames; bad values are usage errors. */
function shardOption(text: string | undefined, frames: number): (ShardSpec & { range: { start: number; end: number } }) | undefined {
  if (text === undefined) return undefined;
  try {
    const spec = text.trim().toLowerCase() === "slurm" ? shardFromSlurm(process.env) : parseShard(text);
    return { ...spec, range: shardRange(spec.index, spec.count, frames) };
  } catch (err) {
    throw new UsageError((err as Error).message.startsWith("--shard") ? (err as Error).message : `--shard ${text}: ${(err as Error).message}`);
  }
}

function preprocessOptions(values: Values): Omit<PreprocessOptions, "boundary"> | undefined {
  const o: Omit<PreprocessOptions, "boundary"> = {};
  if (values.crop !== undefined) {
    const p = (values.crop as string).split(",").map(Number);
    if (p.length !== 4 || !p.every(Number.isInteger)) {
      throw new UsageError(`--crop: expected x,y,width,height in pixels, got ${JSON.stringify(values.crop)}`);
    }
    o.crop = { x: p[0]!, y: p[1]!, width: p[2]!, height: p[3]! };
  }
  const mode = values["background-mode"] as string | undefined;
  if (mode !== undefined && mode !== "divide" && mode !== "subtract") {
    throw new UsageError(`--background-mode: expected divide or subtract, got ${JSON.stringify(mode)}`);
  }
  if (mode !== undefined && values.background === undefined) throw new UsageError("--background-mode needs --background FILE");
  if (values.background !== undefined) o.background = { mode: (mode as "divide" | "subtract" | undefined) ?? "divide" };
  const f = values.flatten as string | undefined;
  if (f !== undefined) {
    const m = /^(highpass):([0-9.]+)$|^(plane)$|^(poly):([123])$|^(lines)$/.exec(f);
    if (!m) throw new UsageError(`--flatten: expected highpass:SIGMA, plane, poly:ORDER (1-3) or lines, got ${JSON.stringify(f)}`);
    if (m[1]) o.flatten = { mode: "gaussian-highpass", sigma: number("flatten", m[2])! };
    else if (m[3]) o.flatten = { mode: "plane" };
    else if (m[4]) o.flatten = { mode: "poly", order: Number(m[5]) as 1 | 2 | 3 };
    else o.flatten = { mode: "lines" };
  }
  const smooth = number("smooth", values.smooth as string | undefined);
  if (smooth !== undefined) o.smooth = { sigma: smooth };
  return Object.keys(o).length > 0 ? o : undefined;
}

async function analyzeToStdout(
  files: string[], options: FrameOptions, fields: FieldValues | undefined, quiet: boolean,
  preprocess: Omit<PreprocessOptions, "boundary"> | undefined, backgroundFile: string | undefined,
): Promise<number> {
  const source = openFrameFiles(files);
  const reference = backgroundFile ? await openFrameFiles(backgroundFile).read(0) : undefined;
  const cache = new AnalyzerCache();
  const progress = new Progress(source.count, "analyze", process.stderr, !quiet);
  let header = false;
  try {
    for (let k = 0; k < source.count; k++) {
      const where = source.describe(k);
      const r = runFrameJob(cache, await source.read(k), k, where, { frame: options, ...(preprocess ? { preprocess } : {}) }, reference);
      const lead: Array<[string, Cell]> = [["frame", k], ["source", where]];
      if (fields) lead.push([`field${fields.unit ? "_" + fields.unit : ""}`, fields.values[k]!]);
      const row = [...lead, ...r.row];
      if (!header) { process.stdout.write(csvLine(row.map(([n]) => n))); header = true; }
      process.stdout.write(csvLine(row.map(([, v]) => v)));
      progress.tick(k + 1);
    }
  } finally {
    cache.dispose();
    progress.done();
  }
  return EXIT.ok;
}

export async function main(argv: string[]): Promise<number> {
  const [command, ...rest] = argv;
  try {
    switch (command) {
      case undefined:
      case "-h":
      case "--help":
        process.stdout.write(HELP.main + "\n");
        return command === undefined ? EXIT.usage : EXIT.ok;
      case "help": {
        const topic = rest[0] ?? "main";
        if (!HELP[topic]) throw new UsageError(`help: unknown command ${JSON.stringify(topic)}`);
        process.stdout.write(HELP[topic] + "\n");
        return EXIT.ok;
      }
      case "--version":
        process.stdout.write(VERSION + "\n");
        return EXIT.ok;
      case "demo":
        return await runDemo(rest);
      case "analyze":
        return await runAnalyze(rest);
      case "loop":
        return await runLoop(rest);
      case "forc":
        return await runForc(rest);
      case "report":
        return await runReport(rest);
      case "merge":
        return await runMerge(rest);
      default:
        throw new UsageError(`unknown command ${JSON.stringify(command)} (commands: demo, analyze, loop, forc, report, merge, help)`);
    }
  } catch (err) {
    if (err instanceof UsageError) {
      process.stderr.write(`domtopo: ${err.message}\n`);
      return EXIT.usage;
    }
    process.stderr.write(`domtopo: ${(err as Error).message}\n`);
    return EXIT.failed;
  }
}
