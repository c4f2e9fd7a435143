// Generated test patterns for the spectrum tests (seeded; data are generated, never copied).
import { RealFFT2D } from "../../src/wasm/fft";
import type { Frame } from "../../src/types";
import { seeded } from "./dft";

/**
 * A +-1 rectangular stripe wave as a phase map: up where frac(q . r) < duty, with the wavevector
 * at `angleDeg` from +x toward +y and `periodPx` pixels between stripes.
 */
export function stripeFrame(w: number, h: number, periodPx: number, angleDeg: number, duty = 0.5): Frame {
  const a = (angleDeg * Math.PI) / 180, cx = Math.cos(a) / periodPx, cy = Math.sin(a) / periodPx;
  const data = new Uint8Array(w * h);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) {
    const t = x * cx + y * cy;
    data[y * w + x] = t - Math.floor(t) < duty ? 1 : 0;
  }
  return { width: w, height: h, data };
}

/** Periodic stripes with integer wavevector (kx, ky) on a w x h torus. */
export function latticeStripes(w: number, h: number, kx: number, ky: number, duty = 0.5): Frame {
  const data = new Uint8Array(w * h);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) {
    const t = (kx * x) / w + (ky * y) / h;
    data[y * w + x] = t - Math.floor(t) < duty ? 1 : 0;
  }
  return { width: w, height: h, data };
}

/** Grey sinusoid cos(2 pi q . r) as Float32 samples. */
export function sinusoidFrame(w: number, h: number, periodPx: number, angleDeg: number): Frame {
  const a = (angleDeg * Math.PI) / 180, cx = Math.cos(a) / periodPx, cy = Math.sin(a) / periodPx;
  const data = new Float32Array(w * h);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) data[y * w + x] = Math.cos(2 * Math.PI * (x * cx + y * cy));
  return { width: w, height: h, data };
}

/** Bubbles (discs of radius r) on a hexagonal lattice of spacing a, one lattice vector along x. */
export function hexBubbles(w: number, h: number, a: number, r: number): Frame {
  const data = new Uint8Array(w * h);
  const rowH = (a * Math.sqrt(3)) / 2;
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) {
    // nearest lattice point among the rows around y
    const j0 = Math.round(y / rowH);
    let up = 0;
    for (let j = j0 - 1; j <= j0 + 1 && !up; j++) {
      const ox = (j & 1) * (a / 2);
      const i = Math.round((x - ox) / a);
      const dx = x - (ox + i * a), dy = y - j * rowH;
      if (dx * dx + dy * dy <= r * r) up = 1;
    }
    data[y * w + x] = up;
  }
  return { width: w, height: h, data };
}

/**
 * A periodic Gaussian random field whose power spectrum is a ring exp(-(q - q0)^2 / (2 s^2)),
 * q0 = 1 / periodPx, s = relWidth q0 (Berk 1987, PRL 58:2718: the random-wave model of a maze).
 * White noise is transformed, filtered in k-space and transformed back with the project's FFT:
 * for a Hermitian Y = Yr + i Yi, y(-r) N = Re F[Yr](r) - Im F[Yi](r).
 */
export function ringField(w: number, h: number, periodPx: number, relWidth: number, seed: number): Float32Array {
  const rnd = seeded(seed);
  const n = w * h;
  const noise = new Float32Array(n);
  for (let i = 0; i < n; i += 2) {
    // Box-Muller
    const u = Math.max(1e-12, rnd()), v = rnd();
    const m = Math.sqrt(-2 * Math.log(u));
    noise[i] = m * Math.cos(2 * Math.PI * v);
    if (i + 1 < n) noise[i + 1] = m * Math.sin(2 * Math.PI * v);
  }
  const fft = new RealFFT2D(w, h);
  try {
    fft.setInput(noise);
    fft.forward();
    const hh = fft.halfHeight, st = fft.stride;
    const re = fft.re().slice(), im = fft.im().slice();
    const q0 = 1 / periodPx, s = relWidth * q0;
    const yr = new Float32Array(n), yi = new Float32Array(n);
    for (let ky = 0; ky < h; ky++) for (let kx = 0; kx < w; kx++) {
      // X(kx, ky) from the half spectrum, or the conjugate of X(-kx, -ky)
      let a: number, b: number;
      if (ky < hh) { a = re[kx * st + ky]!; b = im[kx * st + ky]!; }
      else { const mx = (w - kx) % w, my = h - ky; a = re[mx * st + my]!; b = -im[mx * st + my]!; }
      const qx = (kx <= w / 2 ? kx : kx - w) / w, qy = (ky <= h / 2 ? ky : ky - h) / h;
      const q = Math.hypot(qx, qy);
      const g = Math.exp(-((q - q0) ** 2) / (4 * s * s)); // amplitude: sqrt of the power ring
      yr[ky * w + kx] = a * g; yi[ky * w + kx] = b * g;
    }
    const out = new Float32Array(n);
    const tr = (src: Float32Array) => {
      fft.setInput(src); fft.forward();
      return { re: fft.re().slice(), im: fft.im().slice() };
    };
    const fr = tr(yr), fi = tr(yi);
    for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) {
      // F at (x, y) read as a frequency index; y(-r) lands at (x, y), so write to (-x, -y)
      let vr: number, vi: number;
      if (y < hh) { vr = fr.re[x * st + y]!; vi = fi.im[x * st + y]!; }
      else { const mx = (w - x) % w, my = h - y; vr = fr.re[mx * st + my]!; vi = -fi.im[mx * st + my]!; }
      const ox = (w - x) % w, oy = (h - y) % h;
      out[oy * w + ox] = (vr - vi) / n;
    }
    return out;
  } finally {
    fft.dispose();
  }
}

/** A maze: the sign of a ring field as a phase map. */
export function mazeFrame(w: number, h: number, periodPx: number, relWidth: number, seed: number): Frame {
  const f = ringField(w, h, periodPx, relWidth, seed);
  const data = new Uint8Array(w * h);
  for (let i = 0; i < f.length; i++) data[i] = f[i]! > 0 ? 1 : 0;
  return { width: w, height: h, data };
}
