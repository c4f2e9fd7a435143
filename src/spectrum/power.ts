// The full centred power spectrum of one frame (copy in, copy out).
import type { Frame } from "../types";
import type { SpectrumOptions } from "./options";
import { checkFrame } from "./options";
import type { PowerSpectrum } from "./result";
import { createSpectrumWorkspace, transformInto } from "./workspace";

/**
 * S(k) = |F(k)|^2 / sum(window^2) of the mean-removed, windowed signal, centred (zero frequency at
 * (floor(width/2), floor(height/2))). Throws for frames below 8 px a side or with non-finite samples.
 */
export function powerSpectrum(frame: Frame, options?: SpectrumOptions): PowerSpectrum {
  checkFrame(frame);
  const ws = createSpectrumWorkspace(frame.width, frame.height);
  try {
    if (!transformInto(ws, frame, options)) {
      throw new RangeError("domtopo: the frame holds NaN or infinite samples");
    }
    return ws.powerSpectrum();
  } finally {
    ws.dispose();
  }
}
