import type { Response } from 'express'
import pLimit from 'p-limit'
import { AppError } from './errors.ts'

export interface BoundedLimits {
  /** Jobs running at once. */
  running: number
  /** Jobs waiting for their turn; one more is refused with 503 rather than held in memory. */
  waiting: number
  /** What a refused request is told to wait before trying again, in seconds. */
  retryAfterSeconds: number
}

export interface BoundedQueue {
  readonly limits: BoundedLimits
  /** Jobs running now. */
  readonly running: number
  /** Jobs accepted and waiting for their turn. */
  readonly waiting: number
  /** The most jobs that have run at once since the queue was made. */
  readonly peak: number
  /** True when one more job would be refused. */
  readonly full: boolean
  /** Runs `job` when its turn comes; rejects at once with a 503 `busy` AppError when full. */
  run<T>(job: () => Promise<T>): Promise<T>
}

export const busy = () =>
  new AppError(503, 'busy', 'The server is busy preparing other reports. Please try again shortly.')

/**
 * A queue that runs at most `limits.running` jobs at once and holds at most `limits.waiting`
 * more. Heavy work (a report loaded whole from the database and drawn on the CPU) goes through
 * one, so that a burst of requests waits here instead of on the database pool and the event
 * loop, where every other request would wait behind it.
 */
export function boundedQueue(limits: BoundedLimits): BoundedQueue {
  const limit = pLimit(limits.running)
  let running = 0
  let waiting = 0
  let peak = 0
  const queue: BoundedQueue = {
    limits,
    get running() {
      return running
    },
    get waiting() {
      return waiting
    },
    get peak() {
      return peak
    },
    get full() {
      return running + waiting >= limits.running + limits.waiting
    },
    run<T>(job: () => Promise<T>): Promise<T> {
      if (queue.full) return Promise.reject(busy())
      waiting++
      return limit(async () => {
        waiting--
        running++
        peak = Math.max(peak, running)
        try {
          return await job()
        } finally {
          running--
        }
      })
    },
  }
  return queue
}

/**
 * A handler whose whole work runs through `queue`: when the queue is full it answers 503 with
 * `Retry-After` and the usual error body, before any work.
 */
export function bounded<Req, Res extends Response>(
  queue: BoundedQueue,
  handler: (req: Req, res: Res) => unknown,
) {
  return (req: Req, res: Res): Promise<unknown> => {
    if (queue.full) res.setHeader('Retry-After', String(queue.limits.retryAfterSeconds))
    return queue.run(async () => {
      // A request given up while it waited is not worth its turn.
      if (res.closed || res.destroyed) return
      return handler(req, res)
    })
  }
}
