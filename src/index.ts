// domtopo: the browser-safe library entry. This file only re-exports.
export type { Frame, FrameData } from "./types";
export { init } from "./wasm/instance";
