declare module "upng-js" {
  const UPNG: {
    encode(frames: ArrayBuffer[], width: number, height: number, colours: number, delays?: number[]): ArrayBuffer;
    decode(data: ArrayBuffer | Uint8Array): { width: number; height: number; data: ArrayBuffer };
    toRGBA8(img: unknown): ArrayBuffer[];
  };
  export default UPNG;
}
