export { BlockInspector, type BlockInspectorProps } from "./block-inspector";
export { ScenarioPanel, type ScenarioPanelProps } from "./scenario-panel";
export { PortList, type PortListProps } from "./port-list";
export { ExpressionForm, type ExpressionFormProps, type ExpressionFieldSpec } from "./expression-form";
