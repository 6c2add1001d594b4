/** Noise of blocks and of the assembled system: noise-wave correlation matrices, noise figures, noise parameters. */
export { systemNoise, noiseFigure, type SystemNoise, type NoiseOptions } from "./composite-noise";
export { blockNoise, blockNoiseTerms, DEFAULT_TEMPERATURE_K, type BlockNoise, type BlockNoiseModel, type BlockNoiseTerms } from "./block-noise";
export {
  BOLTZMANN,
  T0,
  chainFromNoiseParameters,
  noiseParametersFromChain,
  waveFromChain,
  chainFromWave,
  type NoiseParameters,
} from "./noise-parameters";
export { partNoiseOnPlan } from "./part-noise";
