// The part of autocannon's programmatic API the benchmark uses (the package ships no types).
declare module 'autocannon' {
  interface Options {
    url: string;
    connections?: number;
    duration?: number;
    headers?: Record<string, string>;
    requests?: Array<{ setupRequest?: (req: Record<string, unknown>) => Record<string, unknown> }>;
  }
  interface Result {
    requests: { total: number; average: number };
    latency: { p50: number; p90: number; p97_5: number; p99: number };
    errors: number;
    timeouts: number;
    non2xx: number;
  }
  export default function autocannon(options: Options): Promise<Result>;
}
