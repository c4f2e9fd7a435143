// The one Wasm module of domtopo: this file only re-exports the kernel families.
export * from "./memory";
export { setGeometry, setBuffers } from "./common";
export * from "./threshold";
export * from "./label";
export * from "./measure";
export * from "./thin";
export * from "./edt";
export * from "./skeleton-graph";
export * from "./fft";
export * from "./spectrum";
export * from "./overlap";
export * from "./hex-label";
export * from "./hex-thin";
