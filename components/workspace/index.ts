export { Workspace, type WorkspaceProps, type SaveState } from "./workspace";
export { PortMenu, type PortMenuProps, type PortMenuAction } from "./port-menu";
export * from "@/components/chart";
export * from "@/components/inspector";
export * from "@/components/results";
export type { PartSummary, WorkspaceBlock, Clipboard, EditResult } from "@/lib/client/scenario-model";
export * as scenarioModel from "@/lib/client/scenario-model";
export { useSolver, type SolverState } from "@/lib/client/use-solver";
