import { createHash } from 'node:crypto'
import type pg from 'pg'
import { RateLimiterPostgres, type RateLimiterRes } from 'rate-limiter-flexible'
import { AppError } from '../http/errors.ts'
import { newToken } from './tokens.ts'

/** At most `points` within `seconds`, counted from the first one; then wait for the window. */
export interface LimitRule {
  points: number
  seconds: number
}

/**
 * Failed password checks, counted three ways as the OWASP Authentication Cheat Sheet describes:
 * one client guessing one account is stopped after a few tries, without touching the same
 * account's owner on another client; one client spraying many accounts is stopped by its own
 * count; many clients guessing one account meet a higher per-account count that only slows the
 * account down for a short window.
 */
export interface PasswordRules {
  pair: LimitRule
  client: LimitRule
  account: LimitRule
}

export const defaultPasswordRules: PasswordRules = {
  pair: { points: 5, seconds: 15 * 60 },
  client: { points: 30, seconds: 15 * 60 },
  account: { points: 20, seconds: 15 * 60 },
}

/** Password-reset mail asked for: per client and per address, so that nobody is mail-bombed. */
export interface ResetRules {
  client: LimitRule
  address: LimitRule
}

export const defaultResetRules: ResetRules = {
  client: { points: 10, seconds: 60 * 60 },
  address: { points: 3, seconds: 60 * 60 },
}

/** Club sign-up mail asked for: per client and per address, like reset requests. */
export type SignupRules = ResetRules

export const defaultSignupRules: SignupRules = {
  client: { points: 10, seconds: 60 * 60 },
  address: { points: 3, seconds: 60 * 60 },
}

export interface LimitRules {
  password: PasswordRules
  reset: ResetRules
  /** Defaults to `defaultSignupRules`. */
  signup?: SignupRules
}

/** The table the counters live in, made by the migrations; every server process shares it. */
const tableName = 'rate_limits'

/** Keys name no address in the clear: the table holds hashes, not who tried what. */
const digest = (value: string) =>
  createHash('sha256').update(value.trim().toLowerCase()).digest('base64url').slice(0, 32)

const tooMany = (seconds: number, message: string) =>
  new AppError(429, 'too_many_attempts', message, undefined, { retryAfterSeconds: seconds })

function limiter(pool: pg.Pool, prefix: string, rule: LimitRule) {
  return new RateLimiterPostgres({
    storeClient: pool,
    storeType: 'pool',
    tableName,
    tableCreated: true,
    clearExpiredByTimeout: false,
    keyPrefix: prefix,
    points: rule.points,
    duration: rule.seconds,
  })
}

/**
 * Counts one use now, atomically in PostgreSQL, and answers the seconds to wait when this use
 * went over the limit, else 0. Counting before the work (not after it) means a burst of
 * concurrent attempts cannot all slip past a count that has not been written yet.
 */
async function take(limit: RateLimiterPostgres, key: string) {
  try {
    await limit.consume(key)
    return 0
  } catch (res) {
    if (res instanceof Error) throw res
    return Math.max(1, Math.ceil((res as RateLimiterRes).msBeforeNext / 1000))
  }
}

/**
 * The client a limit counts: an IPv4 address as it is (also when written IPv4-mapped), an IPv6
 * address by its /64 network, which one subscriber usually holds whole.
 */
export function clientKey(ip: string): string {
  const mapped = /^::ffff:(\d+\.\d+\.\d+\.\d+)$/i.exec(ip)
  if (mapped) return mapped[1]!
  if (!ip.includes(':')) return ip
  const [head = '', tail = ''] = ip.toLowerCase().split('%', 1)[0]!.split('::')
  const left = head ? head.split(':') : []
  const right = ip.includes('::') && tail ? tail.split(':') : []
  const groups = ip.includes('::')
    ? [...left, ...Array<string>(Math.max(0, 8 - left.length - right.length)).fill('0'), ...right]
    : left
  return `${groups
    .slice(0, 4)
    .map((g) => g.replace(/^0+(?=.)/, ''))
    .join(':')}::/64`
}

/**
 * Mail asked for by a client for an address: refused with 429 once either has asked too often
 * in its window. Each request counts first, atomically.
 */
function mailRequests(pool: pg.Pool, prefix: string, rules: ResetRules, message: string) {
  const byClient = limiter(pool, `${prefix}-client`, rules.client)
  const byAddress = limiter(pool, `${prefix}-address`, rules.address)
  return async (email: string, ip: string) => {
    const waits = await Promise.all([
      take(byClient, digest(clientKey(ip))),
      take(byAddress, digest(email)),
    ])
    const wait = Math.max(...waits)
    if (wait > 0) throw tooMany(wait, `${message} Try again in ${wait} seconds.`)
  }
}

/** How long a device that signed in to an account stays known to it. */
const knownDeviceSeconds = 180 * 24 * 3600

/**
 * Every place that checks a password goes through `checkPassword`; password-reset requests go
 * through `assertResetAllowed`, club sign-up requests through `assertSignupAllowed`. Counters
 * live in PostgreSQL, so they hold across processes.
 */
export function createLimits(pool: pg.Pool, rules: LimitRules) {
  const pair = limiter(pool, 'pw-pair', rules.password.pair)
  const client = limiter(pool, 'pw-client', rules.password.client)
  const account = limiter(pool, 'pw-account', rules.password.account)
  const known = limiter(pool, 'pw-device', { points: 1, seconds: knownDeviceSeconds })
  const resetRequests = mailRequests(pool, 'reset', rules.reset, 'Too many reset requests.')
  const signupRequests = mailRequests(
    pool,
    'signup',
    rules.signup ?? defaultSignupRules,
    'Too many sign-up requests.',
  )

  const keys = (email: string, ip: string) => ({
    pair: `${digest(email)}:${digest(clientKey(ip))}`,
    client: digest(clientKey(ip)),
    account: digest(email),
  })
  const deviceKey = (email: string, device: string) => `${digest(email)}:${digest(device)}`

  return {
    /**
     * Runs `verify` (a password check for the account `email`, from the client `ip`) unless a
     * limit refuses first with 429. Every attempt counts before the check; a success gives its
     * count back and clears the pair's. A device that signed in to this account before (its
     * `device` secret, from `rememberDevice`) is not held back by the account's own count, so
     * guessing from elsewhere cannot lock the owner out. Answers what `verify` found, or null.
     */
    async checkPassword<T>(
      email: string,
      ip: string,
      verify: () => Promise<T | null | false>,
      device?: string | null,
    ) {
      const k = keys(email, ip)
      const trusted = device ? (await known.get(deviceKey(email, device))) !== null : false
      const waits = await Promise.all([
        take(pair, k.pair),
        take(client, k.client),
        trusted ? 0 : take(account, k.account),
      ])
      const wait = Math.max(...waits)
      if (wait > 0) {
        throw tooMany(wait, `Too many failed attempts. Try again in ${wait} seconds.`)
      }
      const result = await verify()
      if (result) {
        await Promise.all([
          pair.delete(k.pair),
          client.reward(k.client),
          trusted ? null : account.reward(k.account),
        ])
      }
      return result || null
    },

    /** Remembers a device that signed in to the account; answers the secret for its cookie. */
    async rememberDevice(email: string, device: string = newToken()) {
      await known.set(deviceKey(email, device), 1, knownDeviceSeconds)
      return device
    },

    /** Refuses with 429 once this client or this address asked for too many reset links. */
    assertResetAllowed: resetRequests,

    /** Refuses with 429 once this client or this address asked for too many sign-up links. */
    assertSignupAllowed: signupRequests,
  }
}

export type Limits = ReturnType<typeof createLimits>
