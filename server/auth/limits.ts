import { createHash } from 'node:crypto'
import type pg from 'pg'
import { RateLimiterPostgres, type RateLimiterRes } from 'rate-limiter-flexible'
import { AppError } from '../http/errors.ts'

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

/** Seconds until `key` may try again under `rule`, or 0. */
async function waitFor(limit: RateLimiterPostgres, rule: LimitRule, key: string) {
  const res: RateLimiterRes | null = await limit.get(key)
  if (!res || res.consumedPoints < rule.points) return 0
  return Math.max(1, Math.ceil(res.msBeforeNext / 1000))
}

/** Counts a use; a refusal from the store (already at the limit) is not an error here. */
async function count(limit: RateLimiterPostgres, key: string) {
  try {
    await limit.consume(key)
  } catch (err) {
    if (err instanceof Error) throw err
  }
}

/**
 * Mail asked for by a client for an address: refused with 429 once either has asked too often
 * in its window, else counted.
 */
function mailRequests(pool: pg.Pool, prefix: string, rules: ResetRules, message: string) {
  const byClient = limiter(pool, `${prefix}-client`, rules.client)
  const byAddress = limiter(pool, `${prefix}-address`, rules.address)
  return async (email: string, ip: string) => {
    const waits = await Promise.all([
      waitFor(byClient, rules.client, digest(ip)),
      waitFor(byAddress, rules.address, digest(email)),
    ])
    const wait = Math.max(...waits)
    if (wait > 0) throw tooMany(wait, `${message} Try again in ${wait} seconds.`)
    await Promise.all([count(byClient, digest(ip)), count(byAddress, digest(email))])
  }
}

/**
 * Every place that checks a password goes through `checkPassword`; password-reset requests go
 * through `assertResetAllowed`, club sign-up requests through `assertSignupAllowed`. Counters
 * live in PostgreSQL, so they hold across processes.
 */
export function createLimits(pool: pg.Pool, rules: LimitRules) {
  const pair = limiter(pool, 'pw-pair', rules.password.pair)
  const client = limiter(pool, 'pw-client', rules.password.client)
  const account = limiter(pool, 'pw-account', rules.password.account)
  const resetRequests = mailRequests(pool, 'reset', rules.reset, 'Too many reset requests.')
  const signupRequests = mailRequests(
    pool,
    'signup',
    rules.signup ?? defaultSignupRules,
    'Too many sign-up requests.',
  )

  const keys = (email: string, ip: string) => ({
    pair: `${digest(email)}:${digest(ip)}`,
    client: digest(ip),
    account: digest(email),
  })

  return {
    /**
     * Runs `verify` (a password check for the account `email`, from the client `ip`) unless a
     * limit refuses first with 429; counts a failure (null or false), and clears the pair's
     * count on success. Answers what `verify` found, or null.
     */
    async checkPassword<T>(email: string, ip: string, verify: () => Promise<T | null | false>) {
      const k = keys(email, ip)
      const waits = await Promise.all([
        waitFor(pair, rules.password.pair, k.pair),
        waitFor(client, rules.password.client, k.client),
        waitFor(account, rules.password.account, k.account),
      ])
      const wait = Math.max(...waits)
      if (wait > 0) {
        throw tooMany(wait, `Too many failed attempts. Try again in ${wait} seconds.`)
      }
      const result = await verify()
      if (result) await pair.delete(k.pair)
      else
        await Promise.all([count(pair, k.pair), count(client, k.client), count(account, k.account)])
      return result || null
    },

    /** Refuses with 429 once this client or this address asked for too many reset links. */
    assertResetAllowed: resetRequests,

    /** Refuses with 429 once this client or this address asked for too many sign-up links. */
    assertSignupAllowed: signupRequests,
  }
}

export type Limits = ReturnType<typeof createLimits>
