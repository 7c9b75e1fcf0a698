// The few parts of autocannon 9 that bench:load uses (the package ships no types).
declare module "autocannon" {
  import type { EventEmitter } from "node:events";

  interface AutocannonRequest {
    readonly method?: string;
    readonly path: string;
    readonly headers?: Record<string, string>;
  }
  interface AutocannonOptions {
    readonly url: string;
    readonly connections?: number;
    /** Seconds. */
    readonly duration?: number;
    readonly headers?: Record<string, string>;
    readonly requests?: readonly AutocannonRequest[];
    readonly timeout?: number;
  }
  interface AutocannonResult {
    readonly requests: { readonly average: number; readonly total: number };
    readonly latency: { readonly p50: number; readonly p99: number; readonly average: number };
    readonly non2xx: number;
    readonly errors: number;
    readonly timeouts: number;
    readonly duration: number;
  }
  interface AutocannonInstance extends EventEmitter, PromiseLike<AutocannonResult> {
    on(
      event: "response",
      listener: (
        client: unknown,
        statusCode: number,
        bytes: number,
        responseTimeMs: number,
      ) => void,
    ): this;
  }
  function autocannon(options: AutocannonOptions): AutocannonInstance;
  export default autocannon;
}
