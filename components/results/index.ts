export { ResultsPanel, type ResultsPanelProps } from "./results-panel";
export { downloadText } from "@/lib/browser/downloads";
export { fileStem } from "@/lib/domain/scenarios/file-stem";
export { TracePlot, type TracePlotProps } from "./trace-plot";
export { SmithChart, type SmithChartProps } from "./smith-chart";
export { PortMatrix, type PortMatrixProps } from "./port-matrix";
