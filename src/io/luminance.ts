// Colour to grey. Rec. ITU-R BT.709 luma weights, applied to the stored (gamma-encoded) sample
// values without linearization: Y' = 0.2126 R' + 0.7152 G' + 0.0722 B'.

/** Rec. 709 luma weight of red. */
export const LUMA_RED = 0.2126;
/** Rec. 709 luma weight of green. */
export const LUMA_GREEN = 0.7152;
/** Rec. 709 luma weight of blue. */
export const LUMA_BLUE = 0.0722;

/** Rec. 709 luma of one RGB sample triple, unrounded. */
export function luma(red: number, green: number, blue: number): number {
  return LUMA_RED * red + LUMA_GREEN * green + LUMA_BLUE * blue;
}

/** Rec. 709 luma rounded to the nearest integer (for integer sample types). */
export function lumaRounded(red: number, green: number, blue: number): number {
  return Math.round(LUMA_RED * red + LUMA_GREEN * green + LUMA_BLUE * blue);
}
