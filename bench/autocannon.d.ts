// The few parts of autocannon's result bench/api.bench.ts reads (the package ships no types).
declare module 'autocannon' {
  interface Histogram {
    average: number;
    p50: number;
    p97_5: number;
    p99: number;
    max: number;
  }
  interface Result {
    requests: Histogram & { total: number };
    latency: Histogram;
    non2xx: number;
    errors: number;
  }
  function autocannon(options: { url: string; connections: number; duration: number; headers?: Record<string, string>; workers?: number }): Promise<Result>;
  export default autocannon;
}
