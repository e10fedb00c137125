import type { RequestHandler } from 'express'
import type { ApiIssue } from '../../shared/schemas/errors.ts'
import {
  nulCharacterMessage,
  unstorableText,
  withBrokenCharactersShown,
} from '../../shared/schemas/text.ts'
import { AppError } from './errors.ts'

const maxIssues = 20

/**
 * Refuses any request carrying the NUL character (U+0000) in its path, query or JSON body with
 * 400 `invalid_input`, naming each place. PostgreSQL cannot store NUL in text, so without this
 * one check every text field, present or future, would turn it into a 500. A string or key with
 * half of a UTF-16 surrogate pair (a `\ud800` escape in JSON) is refused the same way: it would
 * be stored as U+FFFD, not as sent.
 */
export const refuseUnstorableText: RequestHandler = (req, _res, next) => {
  const issues: ApiIssue[] = []
  // Route parameters are only known inside the matched route: look at the raw path instead.
  // U+0000 can reach it only percent-encoded.
  const path = req.originalUrl.split('?', 1)[0]!
  if (/%00/i.test(path)) issues.push({ path: 'path', message: nulCharacterMessage })
  collectUnstorable(req.query, ['query'], issues)
  collectUnstorable(req.body, [], issues)
  if (issues.length === 0) return next()
  next(new AppError(400, 'invalid_input', 'Some fields are not valid.', issues))
}

/** No form of Twofold nests deeper; a deeper body is refused before it costs anything. */
const maxDepth = 32

interface Pending {
  value: unknown
  key: string | number | null
  parent: Pending | null
  depth: number
}

/** The path of an entry, built only when an issue is reported: each entry keeps its parent. */
function pathOf(entry: Pending, rootPath: (string | number)[]) {
  const keys: (string | number)[] = []
  for (let e: Pending | null = entry; e && e.key !== null; e = e.parent) keys.push(e.key)
  return [...rootPath, ...keys.reverse()].map(String).join('.')
}

/**
 * Walks a parsed JSON value (without recursion, and in time linear in its size) and adds an
 * issue for each string, or key, that cannot be stored as text, and one for a value nested too deep.
 */
function collectUnstorable(root: unknown, rootPath: (string | number)[], issues: ApiIssue[]) {
  const pending: Pending[] = [{ value: root, key: null, parent: null, depth: 0 }]
  while (pending.length > 0 && issues.length < maxIssues) {
    const entry = pending.pop()!
    const { value, depth } = entry
    if (typeof value === 'string') {
      const problem = unstorableText(value)
      if (problem) issues.push({ path: pathOf(entry, rootPath), message: problem })
      continue
    }
    if (value === null || typeof value !== 'object') continue
    if (depth >= maxDepth) {
      issues.push({ path: pathOf(entry, rootPath), message: 'This is nested too deeply.' })
      return
    }
    if (Array.isArray(value)) {
      // The rows of a CSV import are counted from 1, as the file's rows and the import's own
      // per-row errors are; every other list from 0, as the schemas' issue paths are.
      const importRows =
        rootPath.length === 0 && entry.key === 'rows' && entry.parent?.parent === null
      const first = importRows ? 1 : 0
      for (let i = value.length - 1; i >= 0; i--)
        pending.push({ value: value[i], key: i + first, parent: entry, depth: depth + 1 })
    } else {
      for (const [key, field] of Object.entries(value).reverse()) {
        const problem = unstorableText(key)
        if (problem) {
          const shown = {
            value: null,
            key: withBrokenCharactersShown(key.replaceAll('\u0000', '\uFFFD')),
            parent: entry,
            depth,
          }
          issues.push({ path: pathOf(shown, rootPath), message: problem })
        } else pending.push({ value: field, key, parent: entry, depth: depth + 1 })
      }
    }
  }
}
