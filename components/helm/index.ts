export { Helm } from "./helm";
export { HelmProvider } from "./helm-context";
