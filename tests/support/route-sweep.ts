import { randomUUID } from 'node:crypto'
import type { Express } from 'express'
import type request from 'supertest'
import { apiErrorBodySchema } from '../../shared/schemas/errors.ts'

// Malformed requests for a sweep of every route the app registers: bad path ids, bad bodies,
// bad query parameters. Each case carries a label that names what is wrong, for the report.

export interface RegisteredRoute {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete'
  /** The full pattern, e.g. `/api/clubs/:clubId/elements/:id`. */
  path: string
  /** The names of the route's own handlers, e.g. `requireSignIn`. */
  guards: string[]
}

interface Layer {
  rawPath?: unknown
  route?: { path: string; methods: Record<string, boolean>; stack: { name: string }[] }
  handle: { stack?: Layer[] }
}

const joined = (prefix: string, path: string) =>
  path === '/' && prefix !== '' ? `${prefix}/` : `${prefix}${path}`

/** Every route of the app, read from its routers as Express holds them. */
export function registeredRoutes(app: Express): RegisteredRoute[] {
  const found: RegisteredRoute[] = []
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) {
        for (const method of Object.keys(layer.route.methods)) {
          if (method === '_all') continue
          found.push({
            method: method as RegisteredRoute['method'],
            path: joined(prefix, layer.route.path),
            guards: layer.route.stack.map((l) => l.name),
          })
        }
      } else if (layer.handle.stack && typeof layer.rawPath === 'string') {
        walk(layer.handle.stack, layer.rawPath === '/' ? prefix : `${prefix}${layer.rawPath}`)
      }
    }
  }
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack, '')
  return found
}

/** `METHOD /path` with the club prefix and `/api` left out, as the tables here are keyed. */
export const routeKey = (route: RegisteredRoute) =>
  `${route.method.toUpperCase()} ${route.path.replace(/^\/api(\/clubs\/:clubId)?/, '') || '/'}`

export const paramNames = (path: string) =>
  path
    .split('/')
    .filter((s) => s.startsWith(':'))
    .map((s) => s.slice(1))

/** The pattern with each `:name` replaced by `valueOf(name, segment before it)`. */
export function fillPath(path: string, valueOf: (name: string, owner: string) => string) {
  const segments = path.split('/')
  return segments
    .map((s, i) => (s.startsWith(':') ? valueOf(s.slice(1), segments[i - 1] ?? '') : s))
    .join('/')
}

/** Path ids that name nothing valid. */
export const badIds = (): [string, string][] => [
  ['not a UUID', 'not-a-uuid'],
  ['a UUID of nothing', randomUUID()],
  ['an id with %00', `${randomUUID().slice(0, 8)}%00`],
  ['a very long id', 'a'.repeat(4_000)],
]

export interface BodyCase {
  label: string
  /** The raw request body and its content type. */
  raw: string
  type: string
  /** The field the case spoils, when it spoils one (dotted, as the API names issues). */
  field?: string
  /** The body is replaced as a whole: an issue may name no field. */
  wholeBody?: boolean
}

const jsonType = 'application/json'
const json = (label: string, value: unknown, field?: string): BodyCase => ({
  label,
  raw: JSON.stringify(value),
  type: jsonType,
  field,
})

const uuidLike = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i
const dateLike = /^\d{4}-\d{2}-\d{2}$/
const longText = 'x'.repeat(100_000)

/** Wrong values for one field, given its valid value; `copy` when it is a copy kept as is. */
function wrongValues(value: unknown, copy: boolean): [string, unknown][] {
  if (typeof value === 'string') {
    const wrong: [string, unknown][] = [
      ['an object for a string', { text: value }],
      ['100,000 characters', longText],
    ]
    if (uuidLike.test(value)) wrong.push(['an array for an id', [value]])
    if (uuidLike.test(value) && !copy) wrong.push(['a UUID of nothing', randomUUID()])
    if (dateLike.test(value))
      wrong.push(['February 30th', '2026-02-30'], ['not a date', 'not-a-date'])
    return wrong
  }
  if (typeof value === 'number')
    return [
      ['a string for a number', String(value)],
      ['a negative number', -1],
      ['a fraction', 0.5],
      ['a number past 32 bits', 2 ** 31],
      ['a huge number', 1e20],
    ]
  if (typeof value === 'boolean') return [['a string for a boolean', String(value)]]
  if (value === null) return [['a number for null', 42]]
  if (Array.isArray(value)) return [['an object for a list', {}]]
  return [['a string for an object', 'x']]
}

/** Replaces the value at `path` in a copy of `body`. */
function replaced(body: unknown, path: (string | number)[], value: unknown): unknown {
  if (path.length === 0) return value
  const [head, ...rest] = path
  const copy = (Array.isArray(body) ? [...body] : { ...(body as object) }) as Record<
    string | number,
    unknown
  >
  copy[head!] = replaced(copy[head!], rest, value)
  return copy
}

/** The path of every field and list of a JSON value, its own fields first. */
function fieldPaths(value: unknown, path: (string | number)[] = []): (string | number)[][] {
  if (value === null || typeof value !== 'object') return []
  const entries = Array.isArray(value)
    ? value.map((v, i) => [i, v] as const)
    : Object.entries(value)
  return entries.flatMap(([key, field]) => [[...path, key], ...fieldPaths(field, [...path, key])])
}

const at = (body: unknown, path: (string | number)[]) =>
  path.reduce<unknown>((v, k) => (v as Record<string | number, unknown>)[k], body)

/**
 * Malformed bodies for a route whose valid body is `base`: the body replaced as a whole, then
 * each of its fields in turn spoiled while the others stay valid. Ids of nothing are sent too,
 * except in `copies`: top-level fields holding a copy kept as it was, whose ids may name things
 * deleted since.
 */
export function bodyCases(
  base: unknown,
  { emptyIsValid = false, copies = [] }: { emptyIsValid?: boolean; copies?: string[] } = {},
): BodyCase[] {
  const whole: BodyCase[] = [
    json('a null body', null),
    json('a list body', []),
    json('a string body', 'body'),
    json('a number body', 7),
    ...(emptyIsValid ? [] : [json('an empty object', {})]),
    { label: 'a body that is not JSON', raw: '{"name": ', type: jsonType },
    { label: 'JSON sent as text', raw: JSON.stringify(base ?? {}), type: 'text/plain' },
    { label: 'a form body', raw: 'name=x&id=1', type: 'application/x-www-form-urlencoded' },
    {
      label: 'JSON in UTF-16',
      raw: JSON.stringify(base ?? {}),
      type: `${jsonType}; charset=utf-16`,
    },
  ].map((c) => ({ ...c, wholeBody: true }))
  const isCopy = (path: (string | number)[]) => copies.includes(String(path[0]))
  const fields = fieldPaths(base).flatMap((path) =>
    wrongValues(at(base, path), isCopy(path)).map(([what, value]) =>
      json(`${path.join('.')}: ${what}`, replaced(base, path, value), path.join('.')),
    ),
  )
  return [...whole, ...fields]
}

const longId = 'x'.repeat(5_000)
const typedValue = /^(\d+|true|false|\d{4}-\d{2}-\d{2}|[0-9a-f-]{36})$/i
const encode = (pairs: [string, string][]) =>
  pairs.map(([k, v]) => `${k}=${encodeURIComponent(v)}`).join('&')

export interface QueryCase {
  label: string
  query: string
  /** The key the case spoils. */
  field: string
}

/**
 * Query strings with each key of the route's valid query repeated, too long, and (where its
 * value is an id, a number, a date or a flag rather than free text) of the wrong type or empty.
 */
export function queryCases(base: Record<string, string>): QueryCase[] {
  return Object.entries(base).flatMap(([key, valid]) => {
    const others = Object.entries(base).filter(([k]) => k !== key)
    const spoiled = (label: string, ...values: string[]) => ({
      label: `${key} ${label}`,
      query: encode([...others, ...values.map((v): [string, string] => [key, v])]),
      field: key,
    })
    const cases = [spoiled('repeated', valid, valid), spoiled('5,000 characters long', longId)]
    if (typedValue.test(valid)) cases.push(spoiled('of the wrong type', 'x!'), spoiled('empty', ''))
    return cases
  })
}

/** Query strings with every one of `keys` repeated, of the wrong type, or long, all at once. */
export function spoiledKeys(keys: string[]): [string, string][] {
  const all = (...values: string[]) =>
    encode(keys.flatMap((k) => values.map((v): [string, string] => [k, v])))
  return [
    ['every known key repeated', all('1', '2')],
    ['every known key of the wrong type', all('x!')],
    ['every known key 1,000 characters long', all('x'.repeat(1_000))],
  ]
}

/** What is wrong with an answer a route may give: a fault of the server, or an odd error. */
export function faultProblem(res: request.Response): string | null {
  if (res.status >= 500) return `answered ${res.status}`
  if (res.status >= 400 && !apiErrorBodySchema.safeParse(res.body).success)
    return `answered ${res.status} without the error body`
  return null
}

/**
 * What is wrong with an answer to a malformed request, or null when it is a clear refusal: a
 * 4xx in the API's error shape whose issues each name a field (unless the whole body was
 * wrong), one of them `field` when the case spoilt one.
 */
export function refusalProblem(
  res: request.Response,
  spoilt: { field?: string; wholeBody?: boolean } = {},
): string | null {
  if (res.status < 400) return `answered ${res.status}`
  const fault = faultProblem(res)
  if (fault) return fault
  const issues = apiErrorBodySchema.parse(res.body).error.issues ?? []
  if (!spoilt.wholeBody && issues.some((issue) => issue.path === ''))
    return `an issue names no field: ${JSON.stringify(issues)}`
  const field = spoilt.field
  if (field === undefined) return null
  // List positions aside (an import counts its rows from 1), an issue names the field, or the
  // object or list holding it, or a part of it.
  const shape = (path: string) => path.replaceAll(/\d+/g, '#')
  const named = issues.some((issue) => {
    const [a, b] = [shape(issue.path), shape(field)]
    return a === b || b.startsWith(`${a}.`) || a.startsWith(`${b}.`)
  })
  if (res.status === 400 && issues.length > 0 && !named)
    return `no issue names ${field}: ${JSON.stringify(issues)}`
  return null
}
