// The few parts of autocannon's API that the benchmark uses (the package ships no types).
declare module "autocannon" {
  type Request = { method?: string; path?: string; headers?: Record<string, string> };
  type Options = {
    url: string;
    connections?: number;
    duration?: number;
    timeout?: number;
    headers?: Record<string, string>;
    requests?: Request[];
  };
  type Histogram = { average: number; mean: number; p50: number; p99: number; total: number; min: number; max: number };
  type Result = {
    duration: number;
    errors: number;
    timeouts: number;
    non2xx: number;
    latency: Histogram;
    requests: Histogram;
    throughput: Histogram;
  };
  function autocannon(options: Options): Promise<Result>;
  export default autocannon;
}
