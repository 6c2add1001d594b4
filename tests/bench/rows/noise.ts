// The noise solve's benchmark row (see tests/bench/noise-bench.ts).
export { benchRows } from "../noise-bench";
