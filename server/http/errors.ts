import type { ErrorRequestHandler, RequestHandler } from 'express'
import { ZodError } from 'zod'
import type { ApiErrorBody, ApiIssue } from '../../shared/schemas/errors.ts'

/** An error with an HTTP status and a stable code the client can act on. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly issues?: ApiIssue[],
    readonly details?: Record<string, unknown>,
  ) {
    super(message)
  }
}

export const notFound = (what = 'Not found') => new AppError(404, 'not_found', what)
export const forbidden = (message = 'You do not have access to this.') =>
  new AppError(403, 'forbidden', message)
export const conflict = (message: string, details?: Record<string, unknown>) =>
  new AppError(409, 'conflict', message, undefined, details)

export function zodIssues(error: ZodError): ApiIssue[] {
  return error.issues.map((issue) => ({
    path: issue.path.map(String).join('.'),
    message: issue.message,
  }))
}

/** Unknown `/api` paths answer in JSON like every other API error. */
export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(new AppError(404, 'not_found', `No API route for ${req.method} ${req.path}`))
}

/** How long a client should wait before retrying while the database is unreachable. */
const retryAfterSeconds = 5

// pg's own messages when it cannot reach the server or loses the connection.
const connectionMessages = [
  /^connect E[A-Z]+/,
  /^Connection terminated/,
  /timeout exceeded when trying to connect/,
  /^Client has encountered a connection error/,
]
const connectionErrnos = new Set([
  'ECONNREFUSED',
  'ECONNRESET',
  'ETIMEDOUT',
  'EHOSTUNREACH',
  'ENETUNREACH',
  'EPIPE',
  'ENOTFOUND',
  'EAI_AGAIN',
])
// SQLSTATE 57P01 admin shutdown, 57P02 crash shutdown, 57P03 cannot connect now, 53300 too many
// connections; class 08 is every connection exception.
const unavailableStates = new Set(['57P01', '57P02', '57P03', '53300'])

/**
 * True when the error, or anything it wraps (a Drizzle query error's `cause`, the attempts of an
 * AggregateError), says the database cannot be reached: the request may well succeed later.
 */
export function isDatabaseUnreachable(err: unknown, depth = 0): boolean {
  if (depth > 5 || err === null || typeof err !== 'object') return false
  // The mail transport reports its own connection failures with the SMTP command in flight:
  // those are the mail server's, not the database's.
  if ('command' in err) return false
  const { code, message, syscall, cause, errors } = err as {
    code?: unknown
    message?: unknown
    syscall?: unknown
    cause?: unknown
    errors?: unknown
  }
  if (typeof code === 'string') {
    if (/^08[0-9A-Z]{3}$/.test(code) || unavailableStates.has(code)) return true
    if (connectionErrnos.has(code) || (syscall === 'connect' && /^E[A-Z]+$/.test(code))) return true
  }
  if (typeof message === 'string' && connectionMessages.some((m) => m.test(message))) return true
  if (Array.isArray(errors) && errors.some((e) => isDatabaseUnreachable(e, depth + 1))) return true
  return isDatabaseUnreachable(cause, depth + 1)
}

/** The SQLSTATE of a PostgreSQL error, also when wrapped (Drizzle's query error holds it). */
function sqlStateOf(err: unknown, depth = 0): string | undefined {
  if (depth > 5 || err === null || typeof err !== 'object') return undefined
  const { code, cause } = err as { code?: unknown; cause?: unknown }
  if (typeof code === 'string' && /^[0-9A-Z]{5}$/.test(code)) return code
  return sqlStateOf(cause, depth + 1)
}

/** PostgreSQL refused a character in a text value (NUL above all), wherever it came from. */
const isUnstorableText = (err: unknown) => ['22021', '22P05'].includes(sqlStateOf(err) ?? '')

/**
 * Two requests raced to create the same thing (the same e-mail's account, say) and the second
 * met the unique index: the person is told to look again, not shown a fault.
 */
const isRace = (err: unknown) => ['23505', '40001', '40P01'].includes(sqlStateOf(err) ?? '')

interface BodyParserError extends Error {
  type?: string
  status?: number
}

export const errorHandler: ErrorRequestHandler = (err, req, res, next) => {
  if (res.headersSent) return next(err)
  let status = 500
  let body: ApiErrorBody
  if (err instanceof ZodError) {
    status = 400
    body = {
      error: {
        code: 'invalid_input',
        message: 'Some fields are not valid.',
        issues: zodIssues(err),
      },
    }
  } else if (err instanceof AppError) {
    status = err.status
    body = { error: { code: err.code, message: err.message, issues: err.issues, ...err.details } }
    // A limit's refusal says when to come back, in the header as in the body.
    const wait = err.details?.retryAfterSeconds
    if (typeof wait === 'number') res.setHeader('Retry-After', String(wait))
  } else if ((err as BodyParserError).type === 'entity.parse.failed') {
    status = 400
    body = { error: { code: 'malformed_json', message: 'The request body is not valid JSON.' } }
  } else if ((err as BodyParserError).type === 'entity.too.large') {
    status = 413
    body = { error: { code: 'too_large', message: 'The request body is too large.' } }
  } else if (
    typeof (err as BodyParserError).status === 'number' &&
    (err as BodyParserError).status! < 500
  ) {
    status = (err as BodyParserError).status!
    body = { error: { code: 'bad_request', message: (err as Error).message } }
  } else if (isUnstorableText(err)) {
    // A field the input checks did not reach; the message names what to do, if not where.
    status = 400
    body = {
      error: {
        code: 'invalid_input',
        message: 'Some text holds a character that cannot be saved, such as NUL. Retype it.',
      },
    }
  } else if (isRace(err)) {
    status = 409
    req.log?.warn({ err }, 'concurrent change')
    body = {
      error: {
        code: 'conflict',
        message: 'This was changed by someone else at the same moment. Reload and try again.',
      },
    }
  } else if (isDatabaseUnreachable(err)) {
    status = 503
    req.log?.warn({ err }, 'database unreachable')
    res.setHeader('Retry-After', String(retryAfterSeconds))
    body = {
      error: {
        code: 'unavailable',
        message: 'The database is not reachable right now. Try again in a moment.',
      },
    }
  } else {
    req.log?.error({ err }, 'unhandled error')
    body = {
      error: { code: 'internal', message: 'Something went wrong on our side. Please try again.' },
    }
  }
  // An error is about this moment and this person: never worth keeping in a cache.
  res.setHeader('Cache-Control', 'no-store')
  res.status(status).json(body)
}
