// The few parts of autocannon 8's API the bench uses (the package ships no types).
declare module "autocannon" {
  type Histogram = {
    average: number;
    mean: number;
    stddev: number;
    min: number;
    max: number;
    p50: number;
    p90: number;
    p97_5: number;
    p99: number;
    total?: number;
  };
  export type AutocannonResult = {
    requests: Histogram;
    latency: Histogram;
    duration: number;
    errors: number;
    timeouts: number;
    non2xx: number;
    "1xx": number;
    "2xx": number;
    "3xx": number;
    "4xx": number;
    "5xx": number;
    statusCodeStats: Record<string, { count: number }>;
  };
  export type AutocannonOptions = {
    url: string;
    connections?: number;
    duration?: number;
    timeout?: number;
    method?: string;
    headers?: Record<string, string>;
    body?: string | Buffer;
    /** Requests per second over all connections (a steady rate instead of as fast as possible). */
    overallRate?: number;
    /** Each request may be rebuilt by its setupRequest just before it is sent. */
    requests?: {
      path?: string;
      method?: string;
      headers?: Record<string, string>;
      body?: string;
      setupRequest?: (request: { body?: string }) => object;
    }[];
  };
  type Instance = Promise<AutocannonResult> & {
    stop: () => void;
    on(
      event: "response",
      listener: (client: unknown, statusCode: number, resBytes: number, responseTimeMs: number) => void,
    ): Instance;
  };
  function autocannon(options: AutocannonOptions): Instance;
  export default autocannon;
}
