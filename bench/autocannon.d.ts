// The part of autocannon 9's API the load benchmark uses (the package ships no types).
declare module "autocannon" {
  namespace autocannon {
    interface Request {
      method?: string;
      path?: string;
      headers?: Record<string, string>;
      body?: string;
      // eslint-disable-next-line @typescript-eslint/no-explicit-any
      setupRequest?: (req: Request, context: any) => Request;
      // eslint-disable-next-line @typescript-eslint/no-explicit-any
      onResponse?: (status: number, body: string, context: any) => void;
    }
    interface Histogram {
      average: number;
      p50: number;
      p99: number;
    }
    interface Result {
      requests: Histogram;
      latency: Histogram;
      errors: number;
      timeouts: number;
      non2xx: number;
      statusCodeStats?: Record<string, { count: number }>;
    }
    interface Options {
      url: string;
      connections?: number;
      duration?: number;
      timeout?: number;
      requests?: Request[];
    }
  }
  function autocannon(opts: autocannon.Options): Promise<autocannon.Result>;
  export default autocannon;
}
