/** Interpolation of part data onto a scenario's frequency plan (linear in real and imaginary parts). */
export { interpolateS, type InterpolateOptions, type InterpolateResult } from "./linear";
