// The few parts of autocannon's API the benches use (the package ships no types).
declare module "autocannon" {
  namespace autocannon {
    type Options = { url: string; method?: string; connections?: number; duration?: number; headers?: Record<string, string>; body?: string };
  }
  function autocannon(opts: autocannon.Options, done: (err: Error | null, result: unknown) => void): unknown;
  export default autocannon;
}
