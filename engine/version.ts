/**
 * The engine's version, stored with every check run and written into bundles: a verdict is current only
 * for the engine version that produced it. Raise it with any change that can alter a verdict or a figure
 * (a block model, the interconnection, a check's definition or tolerance); not for refactors.
 */
export const ENGINE_VERSION = "portolan-engine/1";
