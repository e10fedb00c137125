// The hash of an audit's inputs, so that a stored result can be checked against them.

import { defaultAgeThresholds } from '../age-categories.ts'
import { defaultRequirementProfiles } from './readiness.ts'
import { resolveAuditOptions } from './run.ts'
import { sortedRecordPrints } from './record-prints.ts'
import type { AuditInputs, AuditOptions } from './types.ts'

/**
 * JSON with object keys sorted and every array sorted by its items' canonical text, so that the
 * same data in any order gives the same text. Undefined properties are left out, as JSON does.
 * Array order is treated as carrying no meaning, which holds for the audit's inputs: their
 * entities are sets and the audit sorts its output itself.
 */
export function canonicalJson(value: unknown): string {
  // This runs over every record of an audit, so it avoids building intermediate strings and
  // arrays: a flat object goes to JSON.stringify whole, with its keys in sorted order. The default
  // sorts compare UTF-16 code units, the same order as compareText.
  if (Array.isArray(value)) {
    // Stryker disable next-line ArrayDeclaration: equivalent, a presized array only saves growing it; every slot is assigned below
    const items = new Array<string>(value.length)
    for (let i = 0; i < value.length; i++) items[i] = canonicalJson(value[i])
    return `[${items.sort().join(',')}]`
  }
  if (value !== null && typeof value === 'object') {
    const object = value as Record<string, unknown>
    if (flatInKeyOrder(object)) return JSON.stringify(object)
    const keys = Object.keys(object).sort()
    // Stryker disable next-line ArrowFunction,LogicalOperator,BlockStatement: equivalent for JSON data, a shortcut the loop below writes the same text for
    if (keys.every((key) => object[key] === null || typeof object[key] !== 'object')) {
      return JSON.stringify(object, keys)
    }
    let text = ''
    for (const key of keys) {
      const item = object[key]
      if (item === undefined) continue
      text += `${text === '' ? '' : ','}${JSON.stringify(key)}:${canonicalJson(item)}`
    }
    return `{${text}}`
  }
  return JSON.stringify(value) ?? 'null'
}

/**
 * Whether an object holds no object (arrays included) and lists its keys in sorted order, as an
 * audit record does (athleteId, elementId, stepIndex): then plain JSON.stringify gives its
 * canonical text, without a sorted copy of its keys. Keys a `for…in` lists beyond the object's
 * own come after them, so own keys in order are all that a true answer needs.
 */
// Stryker disable next-line BlockStatement: equivalent, an answer of no only skips a shortcut
function flatInKeyOrder(object: Record<string, unknown>): boolean {
  let previous: string | null = null
  for (const key in object) {
    const item = object[key]
    if ((item !== null && typeof item === 'object') || (previous !== null && key <= previous)) {
      return false
    }
    previous = key
  }
  // Stryker disable next-line BooleanLiteral: equivalent, an answer of no only skips a shortcut
  return true
}

/**
 * How an audit's input hash is made. Version 1 (audits stored before version 2) digests the
 * canonical JSON of everything; version 2 digests the canonical JSON of everything but the
 * records, followed by the records' sorted fingerprints (record-prints.ts), which costs a tenth
 * of the time on a large club. A stored audit keeps its version, so a re-check compares like with
 * like.
 */
export type AuditHashVersion = 1 | 2
export const auditHashVersion: AuditHashVersion = 2

/** Whether a stored version is one this code can make (a newer one may come from a later release). */
export function isAuditHashVersion(version: number): version is AuditHashVersion {
  return version === 1 || version === 2
}

/**
 * SHA-256 (hex) of the inputs and resolved options, through the Web Crypto API so the module
 * stays free of I/O and runs in the browser and in Node alike. Defaults are filled in before
 * hashing, so leaving an option out and passing its default give the same hash. The same inputs
 * in any order give the same hash.
 */
export async function auditInputHash(
  inputs: AuditInputs,
  options: AuditOptions = {},
  version: AuditHashVersion = auditHashVersion,
): Promise<string> {
  const { records, ...rest } = inputs
  const described = {
    ...(version === 1 ? inputs : rest),
    paces: inputs.paces ?? {},
    profiles: inputs.profiles ?? defaultRequirementProfiles,
    ageThresholds: inputs.ageThresholds ?? defaultAgeThresholds,
  }
  const text = new TextEncoder().encode(
    canonicalJson({ inputs: described, options: resolveAuditOptions(options) }),
  )
  let message = text
  if (version === 2) {
    const prints = sortedRecordPrints(records)
    message = new Uint8Array(text.length + 1 + prints.length)
    message.set(text)
    message[text.length] = 0x0a // a newline, which the JSON text before it never holds
    message.set(prints, text.length + 1)
  }
  const digest = await crypto.subtle.digest('SHA-256', message)
  return Array.from(new Uint8Array(digest), (byte) => byte.toString(16).padStart(2, '0')).join('')
}
