export { ResultsPanel, type ResultsPanelProps } from "./results-panel";
export { TracePlot, type TracePlotProps } from "./trace-plot";
export { SmithChart, type SmithChartProps } from "./smith-chart";
export { PortMatrix, type PortMatrixProps } from "./port-matrix";
