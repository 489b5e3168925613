/** The few parts of autocannon (which ships no types) that api.bench.ts uses. */
declare module 'autocannon' {
  import type { EventEmitter } from 'node:events';
  namespace autocannon {
    interface Options {
      url: string;
      connections?: number;
      overallRate?: number;
      duration?: number;
      headers?: Record<string, string>;
    }
    interface Result {
      errors: number;
      timeouts: number;
      non2xx: number;
    }
    interface Instance extends EventEmitter {
      on(event: 'response', listener: (client: unknown, statusCode: number, resBytes: number, responseTime: number) => void): this;
    }
  }
  function autocannon(options: autocannon.Options, callback: (err: Error | null, result: autocannon.Result) => void): autocannon.Instance;
  export = autocannon;
}
