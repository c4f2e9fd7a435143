// Minimal declaration of the parts of upng-js (UPNG.js 2.1) that src/io uses.
declare module "upng-js" {
  interface UpngImage {
    width: number;
    height: number;
    depth: number;
    ctype: number;
    frames: {
      rect: { x: number; y: number; width: number; height: number };
      delay: number;
      dispose: number;
      blend: number;
      data?: Uint8Array;
    }[];
    tabs: Record<string, unknown>;
    data: Uint8Array;
  }
  const UPNG: {
    decode(buffer: ArrayBuffer): UpngImage;
    toRGBA8(image: UpngImage): ArrayBuffer[];
    encode(frames: ArrayBuffer[], width: number, height: number, colours: number, delaysMs?: number[]): ArrayBuffer;
  };
  export default UPNG;
}
