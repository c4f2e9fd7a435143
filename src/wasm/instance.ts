// The only place that compiles and instantiates the Wasm module. One compiled module per
// thread (main thread, each worker); one instance per thread, shared by every workspace.
import { KERNEL_BASE64 } from "./kernel-binary";
import type { KernelExports } from "./exports";

let compiled: WebAssembly.Module | undefined;
let instance: KernelExports | undefined;
let pending: Promise<KernelExports> | undefined;

function decodeBase64(text: string): Uint8Array {
  const bin = atob(text);
  const out = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) out[i] = bin.charCodeAt(i);
  return out;
}

function wrap(inst: WebAssembly.Instance): KernelExports {
  return inst.exports as unknown as KernelExports;
}

/**
 * Compiles and instantiates the kernels asynchronously. Required once in a browser main thread
 * (which forbids synchronous compilation of large modules); optional in Node and workers.
 */
export function init(): Promise<KernelExports> {
  if (instance) return Promise.resolve(instance);
  if (!pending) {
    pending = (async () => {
      compiled = await WebAssembly.compile(decodeBase64(KERNEL_BASE64) as BufferSource);
      const inst = await WebAssembly.instantiate(compiled, {});
      instance = wrap(inst);
      return instance;
    })();
  }
  return pending;
}

/** The kernels of this thread, compiled synchronously on first use where the platform allows it. */
export function kernels(): KernelExports {
  if (instance) return instance;
  try {
    compiled = new WebAssembly.Module(decodeBase64(KERNEL_BASE64) as BufferSource);
    instance = wrap(new WebAssembly.Instance(compiled, {}));
  } catch (err) {
    throw new Error(
      "domtopo: the WebAssembly kernels could not be compiled synchronously here " +
        `(${(err as Error).message}); call \`await init()\` once before analyzing frames`,
    );
  }
  return instance;
}
