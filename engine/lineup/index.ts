/** Line-up along a path: gain, noise figure, levels, cascade compression and intercept, headroom. */
export { lineup, type LineupOptions, type LineupResult, type LineupStage } from "./lineup";
