// Plain data shared by every layer.

/** Sample arrays a frame may hold (row-major, `width * height` samples). */
export type FrameData = Uint8Array | Uint16Array | Float32Array;

/** One 2-D image: `data[y * width + x]` is the sample at column x, row y. */
export interface Frame {
  width: number;
  height: number;
  data: FrameData;
}
