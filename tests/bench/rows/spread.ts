// The spread analysis's benchmark row (see tests/bench/spread-bench.ts).
export { benchRows } from "../spread-bench";
