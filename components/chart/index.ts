export { ScenarioChart, linkId, type ScenarioChartProps, type ChartSelection } from "./scenario-chart";
export { BlockNode, CARD_WIDTH, type BlockNodeData, type BlockNodeType } from "./block-node";
export { AddBlockPalette, type AddBlockPaletteProps, type AddBlockChoice } from "./add-block-palette";
export { placePorts, cardHeight, type PortPlacement, type Side } from "./port-layout";
