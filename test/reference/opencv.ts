// Loads OpenCV.js (npm @techstark/opencv-js 4.12.0) once, for cross-checks and benchmarks.
// The module object is a thenable, so it must never be awaited, returned from an async
// function or passed to `resolve` (the promise would chase its `then` forever): we wait for
// `onRuntimeInitialized` when the runtime is not ready yet and hand the module out in a box.
import { createRequire } from "node:module";

// The package's own typings are a large generated file; the few calls used here are untyped.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type OpenCv = any;

let loaded: OpenCv | undefined;

/** Resolves to `{ cv }`, the initialized OpenCV.js module, boxed (see the header). */
export async function loadOpenCv(): Promise<{ cv: OpenCv }> {
  if (!loaded) {
    const require = createRequire(import.meta.url);
    const cv = require("@techstark/opencv-js") as OpenCv;
    if (!cv.Mat) {
      await new Promise((resolve) => {
        cv.onRuntimeInitialized = () => resolve(undefined);
      });
    }
    loaded = cv;
  }
  return { cv: loaded };
}
