// The part of autocannon's programmatic API the benchmarks use (the package ships no types).
declare module 'autocannon' {
  import type { EventEmitter } from 'node:events'

  interface Histogram {
    average: number
    mean: number
    stddev: number
    min: number
    max: number
    total: number
    p50: number
    p90: number
    p99: number
  }

  interface Options {
    url: string
    connections?: number
    duration?: number
    amount?: number
    overallRate?: number
    headers?: Record<string, string>
  }

  interface Result {
    requests: Histogram
    latency: Histogram
    duration: number
    errors: number
    timeouts: number
    non2xx: number
  }

  interface Instance extends EventEmitter, PromiseLike<Result> {
    stop(): void
    on(
      event: 'response',
      listener: (client: unknown, statusCode: number, bytes: number, responseTime: number) => void,
    ): this
  }

  function autocannon(options: Options): Instance
  export default autocannon
}
