// The Wasm side of the spectrum: a 2-D real FFT plan (assembly/fft.ts) built once per frame shape,
// and the power-spectrum reductions that run on its output. Memory is allocated once per plan;
// views returned here stay valid until the next call into the kernels.
import { kernels } from "./instance";
import { wasmAlloc, wasmFree, viewF32, viewF64, viewU8 } from "./heap";

/** Largest side a plan accepts (the kernel's limit). */
export const FFT_MAX_SIDE = 1 << 20;

function checkSide(name: string, v: unknown): number {
  if (typeof v !== "number" || !Number.isInteger(v) || v < 1 || v > FFT_MAX_SIDE) {
    throw new RangeError(
      `domtopo: FFT ${name} must be an integer from 1 to ${FFT_MAX_SIDE}, got ${String(v)}`,
    );
  }
  return v;
}

/**
 * Forward 2-D DFT of a real `width x height` frame (row-major), unnormalized:
 * X(kx, ky) = sum_{x,y} f(x, y) exp(-2 pi i (kx x / width + ky y / height)).
 * Only rows ky = 0 .. floor(height / 2) are kept (the rest is the conjugate at (-kx, -ky)), stored
 * transposed: X(kx, ky) is at `re()[kx * stride + ky]`, `im()[...]`.
 */
export class RealFFT2D {
  readonly width: number;
  readonly height: number;
  /** Number of kept rows ky: floor(height / 2) + 1. */
  readonly halfHeight: number;
  /** Distance between consecutive kx in the spectrum views (floats). */
  readonly stride: number;
  /** @internal plan pointer in Wasm memory */
  readonly plan: number;
  /** @internal input pointer in Wasm memory (width * height f32) */
  readonly inputPtr: number;
  private alive = true;

  constructor(width: number, height: number) {
    this.width = checkSide("width", width);
    this.height = checkSide("height", height);
    const k = kernels();
    const bytes = k.fft2Bytes(width, height);
    if (!(bytes > 0)) throw new RangeError(`domtopo: no FFT plan for ${width} x ${height}`);
    this.plan = wasmAlloc(bytes);
    try {
      this.inputPtr = wasmAlloc(width * height * 4);
    } catch (err) {
      wasmFree(this.plan);
      throw err;
    }
    const tmpBytes = k.fft2InitScratchBytes(width, height);
    const tmp = tmpBytes > 0 ? wasmAlloc(tmpBytes) : 0;
    const ok = k.fft2Init(this.plan, width, height, tmp);
    if (tmp) wasmFree(tmp);
    if (ok !== 1) {
      this.dispose();
      throw new Error(`domtopo: FFT plan set-up failed for ${width} x ${height}`);
    }
    this.halfHeight = (height >> 1) + 1;
    this.stride = k.fft2TStride(this.plan);
    viewF32(this.inputPtr, width * height).fill(0);
  }

  private live(): void {
    if (!this.alive) throw new Error("domtopo: this FFT plan has been disposed");
  }

  /** The input frame in Wasm memory (f32, row-major); write samples here, then `forward()`. */
  input(): Float32Array {
    this.live();
    return viewF32(this.inputPtr, this.width * this.height);
  }

  /** Copies `data` (width * height samples) into the input. */
  setInput(data: ArrayLike<number>): void {
    const n = this.width * this.height;
    if (data.length !== n) {
      throw new RangeError(`domtopo: FFT input needs ${n} samples, got ${data.length}`);
    }
    const v = this.input();
    if (ArrayBuffer.isView(data)) v.set(data as unknown as ArrayLike<number>);
    else for (let i = 0; i < n; i++) v[i] = data[i]!;
  }

  /** Transforms the current input; the spectrum views below hold the result. */
  forward(): void {
    this.live();
    kernels().fft2Forward(this.plan, this.inputPtr);
  }

  /** Real parts, X(kx, ky) at [kx * stride + ky] for ky < halfHeight. */
  re(): Float32Array {
    this.live();
    return viewF32(kernels().fft2TRe(this.plan), this.width * this.stride);
  }

  /** Imaginary parts, same layout as `re()`. */
  im(): Float32Array {
    this.live();
    return viewF32(kernels().fft2TIm(this.plan), this.width * this.stride);
  }

  /** Releases the plan's Wasm memory; the object is unusable afterwards. */
  dispose(): void {
    if (!this.alive) return;
    this.alive = false;
    wasmFree(this.plan);
    if (this.inputPtr) wasmFree(this.inputPtr);
  }
}

/** Radial sums and weights of |X|^2 per bin (copied out). */
export interface RadialSums {
  sums: Float64Array;
  counts: Float64Array;
  /** Weighted number of spectrum points beyond the last bin. */
  outside: number;
}

/** Power-weighted angular moments over a ring (copied out). */
export interface RingSums {
  /** [sum P, sum P cos 2t, sum P sin 2t, sum P cos 6t, sum P sin 6t, points] */
  moments: Float64Array;
  /** Power per angle bin over t in [0, pi). */
  hist: Float64Array;
}

/** Statistics of the frame before the transform. */
export interface PrepareStats {
  /** Window-weighted mean that was removed. */
  mean: number;
  /** Variance of the samples (unweighted). */
  variance: number;
  /** Sum of squares of the windowed, mean-removed samples. */
  energy: number;
}

/**
 * An FFT plan plus the buffers of the spectrum reductions: window tables, statistics, radial
 * bins and ring histogram, all allocated once for a frame shape.
 */
export class SpectrumKernels {
  readonly fft: RealFFT2D;
  private readonly winX: number;
  private readonly winY: number;
  private readonly stats: number;
  private bins = 0;
  private binPtr = 0;
  private angleBins = 0;
  private anglePtr = 0;
  private readonly moments: number;
  private staging = 0;

  constructor(width: number, height: number) {
    this.fft = new RealFFT2D(width, height);
    this.winX = wasmAlloc(width * 4);
    this.winY = wasmAlloc(height * 4);
    this.stats = wasmAlloc(64);
    this.moments = wasmAlloc(64);
  }

  get width(): number { return this.fft.width; }
  get height(): number { return this.fft.height; }

  /** Writes the separable window tables (width and height samples). */
  setWindow(wx: ArrayLike<number>, wy: ArrayLike<number>): void {
    viewF32(this.winX, this.width).set(wx);
    viewF32(this.winY, this.height).set(wy);
  }

  /** Loads samples: `binary` maps nonzero to +1 and zero to -1, `grey` copies them. */
  load(data: ArrayLike<number>, signal: "binary" | "grey"): void {
    const n = this.width * this.height;
    if (signal === "binary" && data instanceof Uint8Array) {
      if (!this.staging) this.staging = wasmAlloc(n);
      viewU8(this.staging, n).set(data);
      kernels().spectrumLoadBinary(this.staging, n, this.fft.inputPtr);
      return;
    }
    const v = this.fft.input();
    if (signal === "grey") {
      if (ArrayBuffer.isView(data)) v.set(data);
      else for (let i = 0; i < n; i++) v[i] = data[i]!;
    } else {
      for (let i = 0; i < n; i++) v[i] = data[i] ? 1 : -1;
    }
  }

  /** Removes the weighted mean and applies the window; undefined when a sample is not finite. */
  prepare(): PrepareStats | undefined {
    const ok = kernels().spectrumPrepare(
      this.fft.inputPtr, this.width, this.height, this.winX, this.winY, this.stats,
    );
    if (ok !== 1) return undefined;
    const s = viewF64(this.stats, 3);
    return { mean: s[0]!, variance: s[1]!, energy: s[2]! };
  }

  forward(): void {
    this.fft.forward();
  }

  private ensureBins(bins: number): void {
    if (bins <= this.bins) return;
    if (this.binPtr) wasmFree(this.binPtr);
    this.binPtr = wasmAlloc(bins * 16);
    this.bins = bins;
  }

  /** Radial sums of |X|^2; `sx`, `sy` convert kx, ky to radius in bins. */
  radial(bins: number, sx: number, sy: number): RadialSums {
    this.ensureBins(bins);
    const sums = this.binPtr, counts = this.binPtr + bins * 8;
    const outside = kernels().spectrumRadial(this.fft.plan, bins, sx, sy, sums, counts);
    return { sums: viewF64(sums, bins).slice(), counts: viewF64(counts, bins).slice(), outside };
  }

  /** Angular moments and histogram of |X|^2 over rLo <= r <= rHi (radius in bins). */
  ring(rLo: number, rHi: number, sx: number, sy: number, angleBins: number): RingSums {
    if (angleBins > this.angleBins) {
      if (this.anglePtr) wasmFree(this.anglePtr);
      this.anglePtr = wasmAlloc(angleBins * 8);
      this.angleBins = angleBins;
    }
    kernels().spectrumRing(this.fft.plan, rLo, rHi, sx, sy, angleBins, this.anglePtr, this.moments);
    return {
      moments: viewF64(this.moments, 6).slice(),
      hist: viewF64(this.anglePtr, angleBins).slice(),
    };
  }

  /** The full centred power spectrum |X|^2 * scale (copied into `out` when given). */
  powerCentred(scale: number, out?: Float32Array): Float32Array {
    const n = this.width * this.height;
    const dst = out ?? new Float32Array(n);
    if (dst.length !== n) throw new RangeError(`domtopo: power output needs ${n} floats`);
    const tmp = wasmAlloc(n * 4);
    try {
      kernels().spectrumPowerCentred(this.fft.plan, scale, tmp);
      dst.set(viewF32(tmp, n));
    } finally {
      wasmFree(tmp);
    }
    return dst;
  }

  dispose(): void {
    this.fft.dispose();
    wasmFree(this.winX);
    wasmFree(this.winY);
    wasmFree(this.stats);
    wasmFree(this.moments);
    if (this.binPtr) wasmFree(this.binPtr);
    if (this.anglePtr) wasmFree(this.anglePtr);
    if (this.staging) wasmFree(this.staging);
    this.binPtr = this.anglePtr = this.staging = 0;
  }
}
