declare module "upng-js" {
  interface UpngImage {
    width: number;
    height: number;
    depth: number;
    ctype: number;
    data: ArrayBuffer;
    frames: Array<{ rect: { x: number; y: number; width: number; height: number }; delay: number; dispose: number; blend: number }>;
    tabs: Record<string, unknown>;
  }
  const UPNG: {
    decode(buffer: ArrayBuffer | Uint8Array): UpngImage;
    toRGBA8(img: UpngImage): ArrayBuffer[];
    encode(bufs: ArrayBuffer[], w: number, h: number, colours: number, delays?: number[], forbidPlte?: boolean): ArrayBuffer;
  };
  export default UPNG;
}
