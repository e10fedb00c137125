import pino, { type Logger, type LoggerOptions } from 'pino'
import type { Env } from './env.ts'

const censor = '[redacted]'

// Keys whose values are credentials wherever they appear: password hashes, reset and invitation
// tokens and their hashes, session ids, cookies, authorization headers.
const secretKey = /passw|secret|token|session.?id|cookie|authori[sz]ation|api.?key/i

const secretPatterns: [RegExp, string][] = [
  // An argon2 encoded hash, salt and digest included.
  [/\$argon2(?:id|i|d)\$[A-Za-z0-9+/=$,.-]*/g, censor],
  [/((?:__Host-)?twofold_session=)[^;,\s"]*/g, `$1${censor}`],
  [/(\bBearer\s+)[^\s",]+/gi, `$1${censor}`],
  [/([?&#](?:token|session)=)[^&#\s"]*/gi, `$1${censor}`],
]

const scrubText = (text: string) =>
  secretPatterns.reduce((out, [pattern, replacement]) => out.replace(pattern, replacement), text)

// Drizzle's query error puts every parameter of the failed query into its message, after the SQL.
const withoutQueryParams = (message: string) => {
  const at = message.startsWith('Failed query: ') ? message.indexOf('\nparams: ') : -1
  return at === -1 ? message : message.slice(0, at)
}

// PostgreSQL's detail repeats the values of a key or of the whole failing row.
const scrubDetail = (detail: string) =>
  detail
    .replace(/(Key \([^)]*\)=)\(.*\)/s, `$1(${censor})`)
    .replace(/(Failing row contains )\(.*\)/s, `$1(${censor})`)

const maxDepth = 8

/**
 * A copy of a value to log with every credential taken out: secret-named keys at any depth,
 * argon2 hashes and session cookies inside any text, and the parameters of a failed query.
 * Plain objects, arrays and errors are copied; anything else (a request, a response) is left to
 * its serializer and to `redact`.
 */
export function scrubSecrets(value: unknown, depth = 0, seen = new WeakSet<object>()): unknown {
  if (typeof value === 'string') return scrubText(value)
  if (value === null || typeof value !== 'object') return value
  if (seen.has(value) || depth > maxDepth) return value instanceof Error ? value.message : '[…]'
  seen.add(value)
  if (value instanceof Error) return scrubError(value, depth, seen)
  if (Array.isArray(value)) return value.map((item) => scrubSecrets(item, depth + 1, seen))
  const proto = Object.getPrototypeOf(value)
  if (proto !== Object.prototype && proto !== null) return value
  const copy: Record<string, unknown> = {}
  for (const [key, field] of Object.entries(value)) {
    copy[key] =
      secretKey.test(key) && field !== null && field !== undefined
        ? censor
        : scrubSecrets(field, depth + 1, seen)
  }
  return copy
}

/**
 * The error as the same kind of error (its type still names it), with a message and stack
 * without the query's parameters or other secrets, the `params` of a failed query left out, and
 * its cause and aggregated errors scrubbed alike.
 */
function scrubError(err: Error, depth: number, seen: WeakSet<object>): Error {
  const copy = Object.create(Object.getPrototypeOf(err)) as Error & Record<string, unknown>
  const message = scrubText(withoutQueryParams(err.message))
  let stack = err.stack ?? ''
  if (stack.includes(err.message)) stack = stack.replace(err.message, () => message)
  else if (stack.includes('\nparams: ')) stack = stack.replace(/\nparams: .*/, '')
  const hidden = { writable: true, configurable: true, enumerable: false }
  Object.defineProperty(copy, 'message', { ...hidden, value: message })
  Object.defineProperty(copy, 'stack', { ...hidden, value: scrubText(stack) })
  if (Object.hasOwn(err, 'name'))
    Object.defineProperty(copy, 'name', { ...hidden, value: err.name })
  for (const [key, field] of Object.entries(err)) {
    if (key === 'params' || key === 'cause') continue
    copy[key] =
      key === 'detail' && typeof field === 'string'
        ? scrubText(scrubDetail(field))
        : secretKey.test(key) && field !== null && field !== undefined
          ? censor
          : scrubSecrets(field, depth + 1, seen)
  }
  // Own but not enumerable when given to the Error constructor; enumerable when assigned.
  if (err.cause !== undefined) copy.cause = scrubSecrets(err.cause, depth + 1, seen)
  const { errors } = err as { errors?: unknown }
  if (Array.isArray(errors))
    Object.defineProperty(copy, 'errors', {
      ...hidden,
      value: errors.map((e) => scrubSecrets(e, depth + 1, seen)),
    })
  return copy
}

export function loggerOptions(env: Pick<Env, 'LOG_LEVEL' | 'NODE_ENV'>): LoggerOptions {
  return {
    level: env.LOG_LEVEL,
    // Request and response headers are bound to each request's logger and not seen by the hook.
    redact: {
      paths: [
        'req.headers.cookie',
        'req.headers.authorization',
        'req.headers["proxy-authorization"]',
        'res.headers["set-cookie"]',
        '*.password',
      ],
      censor,
    },
    hooks: {
      // Every argument of every log call, of this logger and of its children (each request's
      // included, whose error serializer is pino-http's own): nothing secret reaches a line.
      logMethod(args, method) {
        return method.apply(this, args.map((arg) => scrubSecrets(arg)) as Parameters<typeof method>)
      },
    },
  }
}

/** The server's logger: JSON lines on stdout, without credentials. */
export function createLogger(env: Pick<Env, 'LOG_LEVEL' | 'NODE_ENV'>): Logger {
  return pino(loggerOptions(env))
}

interface LoggedRequest {
  url?: string
  query?: unknown
  params?: unknown
  [key: string]: unknown
}

/**
 * What a request line says of the request: pino-http's fields without the query string, whose
 * values (a search, a token pasted into a link) are the person's, not the log's.
 */
export function requestForLog(req: LoggedRequest): LoggedRequest {
  const { query: _query, params: _params, ...rest } = req
  return { ...rest, url: req.url?.split('?', 1)[0] }
}
