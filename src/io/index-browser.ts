// The browser-safe readers and writers. This file only re-exports.
export { decodePng, decodeApng, decodeApngFrame, encodePng, encodeRgbaPng, encodeRgbaApng, isPng, inspectPng } from "./png";
export { openTiff, decodeTiff, isTiff, countTiffPages } from "./tiff";
export { parseNpyHeader, readNpyFrame, decodeNpy, encodeNpy, isNpy } from "./npy";
export { fieldsFromTable, fieldsFromList, fieldsFromSweep, fieldsFromNames, checkFieldCount } from "./fields";
export type { FieldValues, FieldOptions, TableFieldOptions, SweepSegment } from "./fields";
export { naturalSort, naturalCompare } from "./natural";
export { sourceFromBytes, detectFormat } from "./source";
export type { FrameSource, FrameFormat, NamedBytes } from "./source";
