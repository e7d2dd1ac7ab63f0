// The part of autocannon's API the load bench uses (the package ships no types).
declare module "autocannon" {
  import type { EventEmitter } from "node:events";

  export interface Request {
    method?: string;
    path?: string;
    headers?: Record<string, string>;
    body?: string;
  }
  export interface Options {
    url: string;
    connections?: number;
    duration?: number;
    method?: string;
    headers?: Record<string, string>;
    body?: string;
    requests?: Request[];
    timeout?: number;
  }
  export interface Histogram {
    average: number;
    p50: number;
    p97_5: number;
    p99: number;
    max: number;
  }
  export interface Result {
    requests: Histogram & { total: number };
    latency: Histogram;
    errors: number;
    timeouts: number;
    non2xx: number;
    statusCodeStats: Record<string, { count: number }>;
    duration: number;
  }
  export interface Instance extends EventEmitter {
    on(event: "response", listener: (client: unknown, statusCode: number, bytes: number, ms: number) => void): this;
    on(event: "done", listener: (result: Result) => void): this;
  }
  function autocannon(options: Options): Instance;
  export default autocannon;
}
