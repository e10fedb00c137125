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
  } else {
    req.log?.error({ err }, 'unhandled error')
    body = {
      error: { code: 'internal', message: 'Something went wrong on our side. Please try again.' },
    }
  }
  res.status(status).json(body)
}
