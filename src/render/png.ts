// PNG encoding of RGBA pixels (lossless, via upng-js). Browser-safe: bytes out, no file access.
import UPNG from "upng-js";
import type { OverlayImage } from "./overlay";

export function encodePng(img: OverlayImage): Uint8Array {
  const buf = img.rgba.buffer.slice(img.rgba.byteOffset, img.rgba.byteOffset + img.rgba.byteLength) as ArrayBuffer;
  return new Uint8Array(UPNG.encode([buf], img.width, img.height, 0));
}
