// Validation of frames and of the option values shared by every analysis.
import type { Frame, FrameData } from "./types";

function describe(value: unknown): string {
  if (value === null) return "null";
  if (value === undefined) return "undefined";
  if (typeof value === "number") return Number.isNaN(value) ? "NaN" : String(value);
  if (typeof value === "string") return JSON.stringify(value);
  if (ArrayBuffer.isView(value)) return `${value.constructor.name}(${(value as Uint8Array).length})`;
  if (Array.isArray(value)) return `an array of ${value.length}`;
  return typeof value;
}

/** `what` must be a positive integer (a frame size). */
export function checkSize(what: string, value: unknown): number {
  if (typeof value !== "number" || !Number.isInteger(value) || value <= 0) {
    throw new Error(`${what}: expected a positive integer, got ${describe(value)}`);
  }
  if (value > 1 << 15) throw new Error(`${what}: expected at most 32768, got ${value}`);
  return value;
}

/** Checks shape and sample type; returns the frame unchanged. `where` prefixes messages. */
export function checkFrame(frame: Frame, where = "frame"): Frame {
  if (frame === null || typeof frame !== "object") {
    throw new Error(`${where}: expected {width, height, data}, got ${describe(frame)}`);
  }
  const width = checkSize(`${where}.width`, frame.width);
  const height = checkSize(`${where}.height`, frame.height);
  const data = frame.data as FrameData;
  if (!(data instanceof Uint8Array || data instanceof Uint16Array || data instanceof Float32Array)) {
    throw new Error(
      `${where}.data: expected a Uint8Array, Uint16Array or Float32Array, got ${describe(data)}`,
    );
  }
  if (width * height > 1 << 28) {
    throw new Error(`${where}: expected at most 2^28 pixels, got ${width} x ${height}`);
  }
  if (data.length !== width * height) {
    throw new Error(
      `${where}.data: expected ${width} x ${height} = ${width * height} samples, got ${data.length}`,
    );
  }
  return frame;
}

export function checkChoice<T extends string | number>(
  what: string, value: unknown, choices: readonly T[],
): T {
  if (!choices.includes(value as T)) {
    const list = choices.map((c) => (typeof c === "string" ? JSON.stringify(c) : String(c)));
    throw new Error(`${what}: expected one of ${list.join(", ")}, got ${describe(value)}`);
  }
  return value as T;
}

export function checkNumber(what: string, value: unknown, min: number, max = Infinity): number {
  if (typeof value !== "number" || !Number.isFinite(value) || value < min || value > max) {
    const range = max === Infinity ? `a finite number >= ${min}` : `a number in [${min}, ${max}]`;
    throw new Error(`${what}: expected ${range}, got ${describe(value)}`);
  }
  return value;
}

export function checkPositive(what: string, value: unknown): number {
  if (typeof value !== "number" || !Number.isFinite(value) || value <= 0) {
    throw new Error(`${what}: expected a finite number > 0, got ${describe(value)}`);
  }
  return value;
}

export { describe as describeValue };
