// The page's analysis worker: one analyzer per frame shape for the life of the worker, the
// library's own readers and analysis, replies in the pool's {id, ok, result | message} form.
import { createAnalyzer, domainRows, frameRow, hexRaster, init, sourceFromBytes, type Frame, type FrameAnalyzer } from "../src/index";
import type { FrameJob, FrameReply, FrameViews, RgbaImage } from "./protocol";

let analyzer: FrameAnalyzer | undefined;
const ready = init();

function analyzerFor(width: number, height: number): FrameAnalyzer {
  if (!analyzer || analyzer.width !== width || analyzer.height !== height) {
    analyzer?.dispose();
    analyzer = createAnalyzer(width, height);
  }
  return analyzer;
}

/** Grey samples stretched from their minimum to their maximum (NaN shown black). */
function rawImage(frame: Frame, invert: boolean): RgbaImage {
  const { width, height, data } = frame;
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < data.length; i++) {
    const v = Number(data[i]);
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  const span = hi > lo ? hi - lo : 1;
  const rgba = new Uint8ClampedArray(width * height * 4);
  for (let i = 0; i < data.length; i++) {
    let g = ((Number(data[i]) - lo) / span) * 255;
    if (invert) g = 255 - g;
    const o = i * 4;
    rgba[o] = rgba[o + 1] = rgba[o + 2] = g;
    rgba[o + 3] = 255;
  }
  return { width, height, rgba };
}

function hexRawImage(grey: RgbaImage, width: number, height: number, scale: number): RgbaImage {
  const img = hexRaster(width, height, Math.max(3, scale), (site) => {
    const g = grey.rgba[4 * site]!;
    return [g, g, g];
  });
  return { width: img.width, height: img.height, rgba: new Uint8ClampedArray(img.rgba.buffer, img.rgba.byteOffset, img.rgba.length) };
}

async function handle(job: FrameJob): Promise<{ reply: FrameReply; transfer: ArrayBuffer[] }> {
  await ready;
  let frame: Frame;
  if (job.fail !== undefined) {
    throw new Error(job.fail);
  } else if (job.bytes) {
    const source = sourceFromBytes([{ name: job.where, bytes: job.bytes }]);
    frame = await source.read(0);
  } else if (job.frame) {
    frame = job.frame as Frame;
  } else {
    throw new Error(`${job.where}: the job holds neither bytes nor a frame`);
  }
  const a = analyzerFor(frame.width, frame.height);
  const r = a.analyze(frame, job.options, job.where);
  const reply: FrameReply = {
    index: job.index, where: job.where, width: frame.width, height: frame.height,
    row: frameRow(r), domainRows: domainRows(r),
  };
  const transfer: ArrayBuffer[] = [];
  if (job.view) {
    const o = a.overlay({ scale: job.options.grid === "hex" ? Math.max(3, job.view.overlayScale) : job.view.overlayScale });
    // A hexagonal frame is drawn as hexagonal cells (not sheared), at the overlay's scale.
    const raw = job.options.grid === "hex" ? hexRawImage(rawImage(frame, false), frame.width, frame.height, job.view.overlayScale) : rawImage(frame, false);
    const views: FrameViews = {
      raw,
      overlay: { width: o.width, height: o.height, rgba: new Uint8ClampedArray(o.rgba.buffer, o.rgba.byteOffset, o.rgba.length) },
    };
    const sp = r.spectrum;
    if (sp && sp.variance !== undefined && sp.variance > 0 && frame.width >= 8 && frame.height >= 8) {
      const s = a.spectrumImage(sp.peakQ);
      views.spectrum = { width: s.width, height: s.height, rgba: new Uint8ClampedArray(s.data.buffer, s.data.byteOffset, s.data.length) };
    }
    if (sp?.reason) views.spectrumNote = sp.reason;
    reply.views = views;
    transfer.push(views.raw.rgba.buffer as ArrayBuffer, views.overlay.rgba.buffer as ArrayBuffer);
    if (views.spectrum) transfer.push(views.spectrum.rgba.buffer as ArrayBuffer);
  }
  return { reply, transfer };
}

// The pool may post the next job before this one is answered: jobs run one after another.
let last: Promise<unknown> = Promise.resolve();
self.onmessage = (event: MessageEvent<{ id: number; job: FrameJob }>) => {
  const { id, job } = event.data;
  last = last.then(() => handle(job)).then(
    ({ reply, transfer }) => (self as unknown as Worker).postMessage({ id, ok: true, result: reply }, transfer),
    (error: unknown) => (self as unknown as Worker).postMessage({
      id, ok: false, message: error instanceof Error ? error.message : String(error),
    }),
  );
};
