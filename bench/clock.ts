import { performance } from 'node:perf_hooks'

/**
 * Milliseconds since the epoch, to a fraction of one, on the same scale in every process of a
 * benchmark (each process's `performance.now()` counts from its own start).
 */
export const clock = () => performance.timeOrigin + performance.now()

/** One paced request: when its answer arrived (`clock()`), how long it took, its status. */
export interface PacedResponse {
  at: number
  ms: number
  /** 0 when there was no answer, with the error's code. */
  status: number
  error?: string
}
