/** Dense complex linear algebra over interleaved re/im Float64Array storage. */
export { complexMatmul, complexMatmulConjA } from "./matmul";
export { luFactor, luFactorUnchecked, luSolve, luSolveConjTranspose } from "./lu";
export { conditionEstimate1, norm1 } from "./condition";
export { solveLinear, solveComplexInPlace, SINGULAR_CONDITION } from "./solve";
export { hermitianEigenvalues, hermitianTridiagonal, largestHermitianEigenvalue } from "./hermitian-eigen";
export { maxSingularValue, singularValues, sliceFrequency } from "./singular-value";
export { unitarityError } from "./unitarity";
export { reciprocityError } from "./reciprocity";
