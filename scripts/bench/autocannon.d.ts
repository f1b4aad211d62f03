// The parts of autocannon 9's API that the load bench uses (the package ships no types).
declare module "autocannon" {
  namespace autocannon {
    interface Histogram {
      average: number;
      p50: number;
      p90: number;
      p99: number;
      total: number;
    }
    interface Result {
      requests: Histogram;
      latency: Histogram;
      non2xx: number;
      errors: number;
      timeouts: number;
      "2xx": number;
    }
    interface RawRequest {
      method?: string;
      path?: string;
      headers?: Record<string, string>;
      body?: string;
    }
    interface RequestSpec extends RawRequest {
      setupRequest?: (req: RawRequest, context: Record<string, unknown>) => RawRequest;
      onResponse?: (status: number, body: string, context: Record<string, unknown>) => void;
    }
    interface Options {
      url: string;
      connections?: number;
      duration?: number;
      amount?: number;
      maxConnectionRequests?: number;
      /** Seconds before a request counts as timed out (autocannon default: 10). */
      timeout?: number;
      headers?: Record<string, string>;
      requests?: RequestSpec[];
    }
  }
  interface Instance {
    /** Every response: the client, its status, bytes and response time in ms. */
    on(event: "response", listener: (client: unknown, status: number, bytes: number, ms: number) => void): Instance;
  }
  function autocannon(opts: autocannon.Options, done: (err: Error | null, res: autocannon.Result) => void): Instance;
  export default autocannon;
}
