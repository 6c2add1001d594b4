// The integration checks' benchmark rows (see tests/bench/checks-bench.ts).
export { benchRows } from "../checks-bench";
