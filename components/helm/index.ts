export { Helm } from "./helm";
export { HelmProvider, useHelmScenario, useHelmRegistry, type HelmScenarioActions } from "./helm-context";
export { buildCommands, defaultPair, planRange, type HelmCommand, type HelmStep, type HelmData } from "./commands";
