/** Touchstone 1.1 / 2.0 reader and writer (Touchstone File Format Specification 2.0, IBIS Open Forum, 2009). */
export { parseTouchstone, type TouchstoneData, type ParseOptions, type DataFormat, type FrequencyUnit } from "./read";
export { writeTouchstone, type WriteInput, type WriteOptions } from "./write";
export { writeCompositeTouchstone, type CompositeData, type CompositeWriteOptions } from "./composite";
export { noiseRowsOf, type NoiseRows } from "./noise";
export { TouchstoneError } from "./errors";
export { parseDecimal, scaleDecimal, compareDecimal, formatSignificant, formatFixed } from "./numbers";
