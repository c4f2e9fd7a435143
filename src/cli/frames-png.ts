// PNG frames for the command line: 8-bit grey in and out (colour is reduced to Rec. 709 luma).
import UPNG from "upng-js";
import type { Frame } from "../types";

export function decodePngFrame(bytes: Uint8Array, where: string): Frame & { data: Uint8Array } {
  let img;
  try {
    img = UPNG.decode(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer);
  } catch (err) {
    throw new Error(`${where}: not a readable PNG (${(err as Error).message})`);
  }
  if (!img.width || !img.height) throw new Error(`${where}: not a readable PNG (no image header)`);
  const rgba = new Uint8Array(UPNG.toRGBA8(img)[0]!);
  const n = img.width * img.height;
  if (rgba.length < 4 * n) throw new Error(`${where}: PNG data is truncated`);
  const data = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    const r = rgba[4 * i]!, g = rgba[4 * i + 1]!, b = rgba[4 * i + 2]!;
    data[i] = r === g && g === b ? r : Math.round(0.2126 * r + 0.7152 * g + 0.0722 * b);
  }
  return { width: img.width, height: img.height, data };
}

export function encodeGreyPng(frame: Frame & { data: Uint8Array }): Uint8Array {
  const n = frame.width * frame.height;
  const rgba = new Uint8Array(4 * n);
  for (let i = 0; i < n; i++) {
    const v = frame.data[i]!;
    rgba[4 * i] = v; rgba[4 * i + 1] = v; rgba[4 * i + 2] = v; rgba[4 * i + 3] = 255;
  }
  return new Uint8Array(UPNG.encode([rgba.buffer], frame.width, frame.height, 0));
}
