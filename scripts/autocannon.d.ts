// autocannon ships no types; only what scripts/bench-load.ts and bench-scale.ts use is declared.
declare module "autocannon" {
  interface Options {
    url: string;
    connections?: number;
    amount?: number;
    duration?: number;
    timeout?: number;
    headers?: Record<string, string>;
  }
  interface Result {
    errors: number;
    timeouts: number;
    non2xx: number;
  }
  interface Instance extends PromiseLike<Result> {
    on(event: "response", listener: (client: unknown, statusCode: number, resBytes: number, responseTime: number) => void): this;
  }
  export default function autocannon(options: Options): Instance;
}
