import type { ApiIssue } from '@shared/schemas/errors'
import { apiErrorBodySchema } from '@shared/schemas/errors'

/** An answer other than 2xx from the API, with the server's code, message and field issues. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly issues: ApiIssue[] = [],
    readonly body: unknown = undefined,
  ) {
    super(message)
    this.name = 'ApiError'
  }

  /** The first message for a field path, for showing beside the field. */
  issueFor(path: string): string | undefined {
    return this.issues.find((issue) => issue.path === path)?.message
  }
}

type UnauthorizedListener = () => void
let onUnauthorized: UnauthorizedListener | undefined

/** The session store registers here to hear of a 401 from any request. */
export function setUnauthorizedListener(listener: UnauthorizedListener | undefined) {
  onUnauthorized = listener
}

export interface RequestOptions {
  method?: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE'
  body?: unknown
  query?: Record<string, string | number | boolean | undefined | null>
  signal?: AbortSignal
}

/** The path with the non-empty query values appended. */
export function withQuery(path: string, query: RequestOptions['query']) {
  if (!query) return path
  const params = new URLSearchParams()
  for (const [key, value] of Object.entries(query)) {
    if (value !== undefined && value !== null && value !== '') params.set(key, String(value))
  }
  const text = params.toString()
  return text ? `${path}?${text}` : path
}

/** The one place the client calls `fetch`. Resolves with the parsed JSON body. */
export async function request<T>(path: string, options: RequestOptions = {}): Promise<T> {
  const init: RequestInit = {
    method: options.method ?? 'GET',
    credentials: 'same-origin',
    headers: { Accept: 'application/json' },
    signal: options.signal,
  }
  if (options.body !== undefined) {
    init.body = JSON.stringify(options.body)
    init.headers = { ...init.headers, 'Content-Type': 'application/json' }
  }
  let response: Response
  try {
    response = await fetch(withQuery(`/api${path}`, options.query), init)
  } catch (err) {
    if ((err as Error).name === 'AbortError') throw err
    throw new ApiError(
      0,
      'network',
      'Twofold cannot be reached. Check the connection and try again.',
    )
  }
  const text = await response.text()
  const data: unknown = text ? safeJson(text) : undefined
  if (response.ok) return data as T
  if (response.status === 401) onUnauthorized?.()
  const parsed = apiErrorBodySchema.safeParse(data)
  if (parsed.success) {
    const { code, message, issues } = parsed.data.error
    throw new ApiError(response.status, code, message, issues ?? [], data)
  }
  throw new ApiError(response.status, 'http_error', `The server answered ${response.status}.`)
}

export function safeJson(text: string): unknown {
  try {
    return JSON.parse(text)
  } catch {
    return undefined
  }
}
