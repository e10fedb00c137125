/**
 * Slows down password guessing against one account without locking anybody else out: after
 * `freeAttempts` failures within `windowMs`, each further attempt on that account must wait,
 * doubling from `baseDelayMs` up to `maxDelayMs`. A success clears the account's count.
 * Kept in memory: one server process serves the club.
 */
export class SignInThrottle {
  private failures = new Map<string, { count: number; first: number; blockedUntil: number }>()

  constructor(
    private readonly options = {
      freeAttempts: 5,
      windowMs: 15 * 60_000,
      baseDelayMs: 30_000,
      maxDelayMs: 15 * 60_000,
    },
    private readonly now: () => number = Date.now,
  ) {}

  /** Seconds to wait before trying this account again, or 0. */
  retryAfter(key: string): number {
    const entry = this.current(key)
    if (!entry) return 0
    return Math.max(0, Math.ceil((entry.blockedUntil - this.now()) / 1000))
  }

  recordFailure(key: string) {
    const now = this.now()
    const entry = this.current(key) ?? { count: 0, first: now, blockedUntil: 0 }
    entry.count++
    const over = entry.count - this.options.freeAttempts
    if (over >= 0) {
      const delay = Math.min(this.options.maxDelayMs, this.options.baseDelayMs * 2 ** over)
      entry.blockedUntil = now + delay
    }
    this.failures.set(key, entry)
    if (this.failures.size > 10_000) this.prune()
  }

  recordSuccess(key: string) {
    this.failures.delete(key)
  }

  private current(key: string) {
    const entry = this.failures.get(key)
    if (!entry) return undefined
    const now = this.now()
    if (now - entry.first > this.options.windowMs && now >= entry.blockedUntil) {
      this.failures.delete(key)
      return undefined
    }
    return entry
  }

  private prune() {
    for (const key of [...this.failures.keys()]) this.current(key)
  }
}
