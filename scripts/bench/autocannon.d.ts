// The part of autocannon 9's programmatic API the benchmark uses (the package ships no types).
declare module 'autocannon' {
  import type { EventEmitter } from 'node:events'

  export interface Histogram {
    average: number
    mean: number
    stddev: number
    min: number
    max: number
    total: number
    p50: number
    p90: number
    p97_5: number
    p99: number
  }

  export interface Result {
    requests: Histogram & { sent: number }
    latency: Histogram
    throughput: Histogram
    duration: number
    errors: number
    timeouts: number
    non2xx: number
    resets: number
    statusCodeStats: Record<string, { count: number }>
  }

  export interface Options {
    url: string
    connections?: number
    duration?: number
    method?: 'GET' | 'POST' | 'PUT' | 'DELETE'
    headers?: Record<string, string>
    body?: string
    timeout?: number
    title?: string
    /** Per-request set-up: may rewrite the request (autocannon 9 `requests[].setupRequest`). */
    requests?: Array<{ setupRequest?: (request: { path: string; method?: string }) => { path: string; method?: string } }>
  }

  export interface Instance extends EventEmitter {
    on(event: 'response', listener: (client: unknown, statusCode: number, resBytes: number, responseTime: number) => void): this
    on(event: string, listener: (...args: unknown[]) => void): this
  }

  function autocannon(options: Options, callback: (error: Error | null, result: Result) => void): Instance
  export default autocannon
}
