import { beforeEach, describe, expect, it } from 'vitest'
import { packAuditResult, unpackAuditResult } from '../../server/services/audit-storage.ts'
import { runAudit } from '../../shared/domain/audit/run.ts'
import type { AuditElement, AuditInputs, AuditResult } from '../../shared/domain/audit/types.ts'
import {
  athleteFullName,
  confirmationMatches,
  replaceAthleteId,
} from '../../shared/domain/erasure.ts'

// Typing the name to confirm a destructive action is common practice (no published source).

describe('confirmationMatches', () => {
  it.each([
    ['Ada Quillmere', 'Ada Quillmere', true],
    ['  Ada Quillmere ', 'Ada Quillmere', true],
    ['ada quillmere', 'Ada Quillmere', false],
    ['Ada', 'Ada Quillmere', false],
    ['Ada  Quillmere', 'Ada Quillmere', false],
    ['', '', false],
    ['   ', ' ', false],
  ])('%j against %j is %s', (typed, name, expected) => {
    expect(confirmationMatches(typed, name)).toBe(expected)
  })

  it('asks for the given name, then the family name', () => {
    expect(athleteFullName({ givenName: 'Ada', familyName: 'Quillmere' })).toBe('Ada Quillmere')
  })
})

const element = (
  id: string,
  direction: AuditElement['direction'],
  counterpartId: string,
): AuditElement => ({
  id,
  name: id.toUpperCase(),
  apparatus: 'floor',
  direction,
  rotationClass: 'single',
  twistBand: 'none',
  counterpartId,
  stepCount: 5,
})
// Both athletes trail forward (gaps) and turn 16 in 2026, senior in women's artistic (readiness).
const inputs: AuditInputs = {
  asOf: '2025-09-15',
  elements: [element('bt', 'backward', 'ft'), element('ft', 'forward', 'bt')],
  athletes: [
    { id: 'erased-one', squadId: 'squad-a', birthYear: 2010, discipline: 'artistic-women' },
    { id: 'stays', squadId: 'squad-a', birthYear: 2010, discipline: 'artistic-women' },
  ],
  records: [
    { athleteId: 'erased-one', elementId: 'bt', stepIndex: 4 },
    { athleteId: 'stays', elementId: 'bt', stepIndex: 3 },
  ],
  paces: {},
}
const swapped = <T>(value: T): T =>
  JSON.parse(JSON.stringify(value).replaceAll('"erased-one"', '"fresh-id"'))

describe('replaceAthleteId', () => {
  // In a hook, not while the file is collected: a throw fails the tests, not the collection, and
  // mutation testing sees which test runs which code.
  let result: AuditResult
  beforeEach(() => {
    result = runAudit(inputs)
  })

  it('replaces the id in every row of the stored form, and nothing else', () => {
    expect(result.gaps.map((g) => g.athleteId)).toContain('erased-one')
    expect(result.readiness.map((r) => r.athleteId)).toContain('erased-one')
    const replaced = replaceAthleteId(packAuditResult(result), 'erased-one', 'fresh-id')!
    expect(JSON.stringify(replaced)).not.toContain('erased-one')
    expect(unpackAuditResult(replaced)).toStrictEqual(swapped(result))
  })

  it('replaces it in the gaps too in a result stored whole, before the compact form', () => {
    const replaced = replaceAthleteId(result, 'erased-one', 'fresh-id')!
    expect(replaced).toStrictEqual(swapped(result))
    expect(JSON.stringify(replaced)).toBe(JSON.stringify(swapped(result)))
  })

  it('answers null for a result that does not list the athlete', () => {
    expect(replaceAthleteId(packAuditResult(result), 'someone-else', 'fresh-id')).toBeNull()
  })
})
