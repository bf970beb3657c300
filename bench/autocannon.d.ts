// The few parts of autocannon's API the load benchmark uses (the package ships no types).
declare module 'autocannon' {
  namespace autocannon {
    interface Histogram {
      average: number;
      p50: number;
      p99: number;
    }
    interface Result {
      requests: Histogram;
      latency: Histogram;
      errors: number;
      non2xx: number;
    }
    interface Client {
      setHeaders(headers: Record<string, string>): void;
    }
    interface Options {
      url: string;
      title?: string;
      connections?: number;
      duration?: number;
      /** Requests per second over all connections; latencies are corrected for coordinated omission. */
      overallRate?: number;
      requests?: { method: string; path: string; setupRequest?: (req: Record<string, unknown>, context: { cookie?: string }) => Record<string, unknown> }[];
      setupClient?: (client: Client) => void;
    }
  }
  function autocannon(options: autocannon.Options): Promise<autocannon.Result>;
  export default autocannon;
}
