// One frame of a sequence as a job: analyze it and return the rows the tables need. The same
// function runs in a worker thread, a Web Worker, or in the calling thread.
import type { Frame } from "../types";
import { FrameAnalyzer } from "../topology/analyze";
import type { FrameOptions } from "../topology/options";
import { frameRow, domainRows, csvLine, csvCell, type Cell } from "../topology/rows";
import { encodeRgbaPng } from "../io/png";
import { Preprocessor, type PreprocessOptions } from "../prep/preprocess";

export interface FrameJobOptions {
  frame: FrameOptions;
  /** Return the per-domain rows. @default false */
  domains?: boolean;
  /** Cells put in front of every per-domain row (e.g. the frame's index, source and field). */
  domainLead?: Cell[];
  /** Return the label image and the columns that tracking needs (transferable). @default false */
  tracking?: boolean;
  /** Return an overlay PNG of every `every`-th frame (kinds, skeleton, ends and junctions). */
  overlay?: { every: number; scale: number };
  /** Return the power spectrum image (PNG) of every `every`-th frame. */
  spectra?: { every: number };
  /**
   * Crop, background reference, flattening and smoothing before the threshold (the sides come
   * from `frame.boundary`). A background reference is passed to `runFrameJob` separately.
   */
  preprocess?: Omit<PreprocessOptions, "boundary">;
}

export interface TrackingInput {
  labels: Int32Array;
  count: number;
  phase: Uint8Array;
  area: Float64Array;
  centroidX: Float64Array;
  centroidY: Float64Array;
}

export interface FrameJobResult {
  index: number;
  where: string;
  width: number;
  height: number;
  row: Array<[string, Cell]>;
  /** The frame's rows of the domain table as CSV lines, UTF-8, each led by `domainLead` (transferable). */
  domainBytes?: Uint8Array;
  tracking?: TrackingInput;
  overlayPng?: Uint8Array;
  spectrumPng?: Uint8Array;
}

/** Keeps one analyzer (and preprocessor) per frame shape for the life of a thread. */
export class AnalyzerCache {
  private analyzer: FrameAnalyzer | undefined;
  private prep: { key: string; reference: Frame | undefined; p: Preprocessor } | undefined;

  preprocessor(frame: Frame, options: PreprocessOptions, reference: Frame | undefined): Preprocessor {
    const key = `${frame.width}x${frame.height}:${JSON.stringify(options)}`;
    if (!this.prep || this.prep.key !== key || this.prep.reference !== reference) {
      this.prep = { key, reference, p: new Preprocessor(frame.width, frame.height, options, reference) };
    }
    return this.prep.p;
  }

  get(width: number, height: number): FrameAnalyzer {
    if (!this.analyzer || this.analyzer.width !== width || this.analyzer.height !== height) {
      this.analyzer?.dispose();
      this.analyzer = new FrameAnalyzer(width, height);
    }
    return this.analyzer;
  }

  dispose(): void {
    this.analyzer?.dispose();
    this.analyzer = undefined;
  }
}

export function runFrameJob(
  cache: AnalyzerCache, input: Frame, index: number, where: string, options: FrameJobOptions, reference?: Frame,
): FrameJobResult {
  let frame = input;
  if (options.preprocess) {
    const p = cache.preprocessor(input, { ...options.preprocess, boundary: options.frame.boundary ?? "open" }, reference);
    frame = p.process(input, where).frame;
  }
  const analyzer = cache.get(frame.width, frame.height);
  const r = analyzer.analyze(frame, { ...options.frame, keepLabels: Boolean(options.tracking) }, where);
  const out: FrameJobResult = { index, where, width: frame.width, height: frame.height, row: frameRow(r) };
  if (options.domains) {
    // Written here, in the worker, as bytes (one flat string of lines, encoded once), so the
    // thread that writes the tables only writes them.
    // (the lead cells are the same on every row: written once)
    const lead = (options.domainLead ?? []).map((c) => `${csvCell(c)},`).join("");
    const lines = domainRows(r).map((d) => lead + csvLine(d));
    out.domainBytes = new TextEncoder().encode(lines.join(""));
  }
  if (options.overlay && index % options.overlay.every === 0 && r.skeleton) {
    const img = analyzer.overlay({ scale: options.overlay.scale });
    out.overlayPng = encodeRgbaPng(img.width, img.height, img.rgba);
  }
  if (options.spectra && index % options.spectra.every === 0 && r.spectrum && r.spectrum.variance !== undefined) {
    const peak = r.spectrum.peakQ;
    const img = analyzer.spectrumImage(peak);
    out.spectrumPng = encodeRgbaPng(img.width, img.height, img.data);
  }
  if (options.tracking) {
    const d = r.domains;
    out.tracking = {
      labels: r.labels!, count: d.count, phase: d.phase, area: d.area, centroidX: d.centroidX, centroidY: d.centroidY,
    };
  }
  return out;
}

/** The buffers of a result that can be moved rather than copied between threads. */
export function transferablesOf(result: FrameJobResult): ArrayBuffer[] {
  const out: ArrayBuffer[] = [];
  const t = result.tracking;
  if (t) out.push(...[t.labels.buffer, t.phase.buffer, t.area.buffer, t.centroidX.buffer, t.centroidY.buffer] as ArrayBuffer[]);
  if (result.overlayPng) out.push(result.overlayPng.buffer as ArrayBuffer);
  if (result.domainBytes) out.push(result.domainBytes.buffer as ArrayBuffer);
  if (result.spectrumPng) out.push(result.spectrumPng.buffer as ArrayBuffer);
  return out;
}
