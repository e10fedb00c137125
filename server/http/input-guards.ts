import type { RequestHandler } from 'express'
import type { ApiIssue } from '../../shared/schemas/errors.ts'
import { hasNulCharacter, nulCharacterMessage } from '../../shared/schemas/text.ts'
import { AppError } from './errors.ts'

const maxIssues = 20

/**
 * Refuses any request carrying the NUL character (U+0000) in its path, query or JSON body with
 * 400 `invalid_input`, naming each place. PostgreSQL cannot store NUL in text, so without this
 * one check every text field, present or future, would turn it into a 500.
 */
export const refuseNulCharacters: RequestHandler = (req, _res, next) => {
  const issues: ApiIssue[] = []
  // Route parameters are only known inside the matched route: look at the raw path instead.
  // U+0000 can reach it only percent-encoded.
  const path = req.originalUrl.split('?', 1)[0]!
  if (/%00/i.test(path)) issues.push({ path: 'path', message: nulCharacterMessage })
  collectNul(req.query, ['query'], issues)
  collectNul(req.body, [], issues)
  if (issues.length === 0) return next()
  next(new AppError(400, 'invalid_input', 'Some fields are not valid.', issues))
}

/**
 * Walks a parsed JSON value (without recursion, so a deeply nested body cannot overflow the
 * stack) and adds an issue for each string, or key, holding NUL.
 */
function collectNul(root: unknown, rootPath: (string | number)[], issues: ApiIssue[]) {
  const pending: { value: unknown; path: (string | number)[] }[] = [{ value: root, path: rootPath }]
  while (pending.length > 0 && issues.length < maxIssues) {
    const { value, path } = pending.pop()!
    if (typeof value === 'string') {
      if (hasNulCharacter(value))
        issues.push({ path: issuePath(path), message: nulCharacterMessage })
    } else if (Array.isArray(value)) {
      // The rows of a CSV import are counted from 1, as the file's rows and the import's own
      // per-row errors are; every other list from 0, as the schemas' issue paths are.
      const first = path.length === 1 && path[0] === 'rows' ? 1 : 0
      for (let i = value.length - 1; i >= 0; i--)
        pending.push({ value: value[i], path: [...path, i + first] })
    } else if (value !== null && typeof value === 'object') {
      for (const [key, field] of Object.entries(value).reverse()) {
        if (hasNulCharacter(key)) {
          const shown = [...path, key.replaceAll('\u0000', '\uFFFD')]
          issues.push({ path: issuePath(shown), message: nulCharacterMessage })
        } else pending.push({ value: field, path: [...path, key] })
      }
    }
  }
}

const issuePath = (path: (string | number)[]) => path.map(String).join('.')
