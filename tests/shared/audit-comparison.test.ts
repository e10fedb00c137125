import { beforeEach, describe, expect, it } from 'vitest'
import {
  baselineAudit,
  compareAudits,
  isRerun,
  onePerDate,
} from '../../shared/domain/audit/comparison.ts'
import { runAudit } from '../../shared/domain/audit/run.ts'
import {
  auditFigures,
  type AuditHeadline,
  type AuditResult,
} from '../../shared/domain/audit/types.ts'
import { athletes, inputs, rec, records } from '../support/audit-example.ts'

// Product brief, "Privacy and trust": every figure a board reads must mean what it says; "no
// data" is never shown as 0.

describe('no data is not a lag of 0', () => {
  // The worked example plus squad-c, whose one athlete has no record at all, and squad-d, whose
  // one athlete has a record never started (no step): neither squad has any data.
  // In a hook (see audit.test.ts): a throw fails the tests, not the file's collection.
  let result: AuditResult
  beforeEach(() => {
    result = runAudit({
      ...inputs,
      athletes: [
        ...athletes,
        { id: 'fay', squadId: 'squad-c', birthYear: 2015, discipline: 'artistic-women' },
        { id: 'gus', squadId: 'squad-d', birthYear: 2015, discipline: 'artistic-men' },
      ],
      records: [...records, rec('gus', 'bt', null)],
    })
  })
  const squad = (id: string) => result.squads.find((s) => s.squadId === id)!
  const athlete = (id: string) => result.athletes.find((a) => a.athleteId === id)!

  it('gives an athlete without records no lag, and one with records theirs', () => {
    // cai's one record was never started: no data, as for fay (no record) and gus
    for (const id of ['cai', 'fay', 'gus']) {
      expect(athlete(id)).toMatchObject({ frontLag: null, backLag: null })
    }
    // ben has forward progress only: front-lag 0 by the brief's rule (no backward progress),
    // which is data; back-lag 1 − 0 / 0.4 = 1 (ft 2/5 with no backward counterpart reached)
    expect(athlete('ben')).toMatchObject({ frontLag: 0, backLag: 1 })
  })

  it('gives a squad without records no lag, counts it apart and keeps the others', () => {
    expect(squad('squad-c')).toMatchObject({
      athletesWithRecords: 0,
      frontLag: null,
      backLag: null,
    })
    expect(squad('squad-d')).toMatchObject({
      athletesWithRecords: 0,
      frontLag: null,
      backLag: null,
    })
    // squad-b: dee has records, cai none; its lag is dee's alone, 1 (nothing forward)
    expect(squad('squad-b')).toMatchObject({ athleteCount: 2, athletesWithRecords: 1, frontLag: 1 })
    expect(result.headline.squadsWithoutRecords).toBe(2)
    expect(result.headline.squadFrontLags['squad-c']).toBeNull()
    expect(result.headline.clubFrontLag).not.toBeNull()
  })

  it('gives a scope where nobody has records no club lag', () => {
    const empty = runAudit({ ...inputs, records: [rec('cai', 'bt', null)] })
    expect(empty.headline.clubFrontLag).toBeNull()
    expect(empty.headline.clubBackLag).toBeNull()
    expect(empty.headline.balanceRatio).toBeNull()
    expect(empty.headline.squadsWithoutRecords).toBe(2)
    // and nothing to compare with: no change, rather than a change from or to 0
    expect(compareAudits(empty, runAudit(inputs)).clubFrontLag.change).toBeNull()
  })
})

describe('the audit a change is measured from', () => {
  // Hand-made history of one scope, in the order the audits were run:
  //   a  2025-03-31 published
  //   b  2025-06-30 published
  //   c  2025-06-30 draft, a re-run of b's date
  //   d  2025-09-30 published
  //   e  2025-09-30 draft, a re-run of d's date
  const audit = (id: string, asOf: string, createdAt: number, published: boolean) => ({
    id,
    asOf,
    createdAt,
    published,
  })
  const a = audit('a', '2025-03-31', 1, true)
  const b = audit('b', '2025-06-30', 2, true)
  const c = audit('c', '2025-06-30', 3, false)
  const d = audit('d', '2025-09-30', 4, true)
  const e = audit('e', '2025-09-30', 5, false)
  const scope = [e, c, a, d, b]

  it.each([
    // a published audit: the latest published one of an earlier date (the board's view too)
    ['d', d, 'b'],
    ['b', b, 'a'],
    // a draft: the latest of an earlier date, the last run for that date
    ['e', e, 'c'],
    // never one of the same date: a re-run is not a change over time
    ['c', c, 'a'],
    ['a', a, null],
  ])('measures %s from %s', (_name, current, expected) => {
    expect(baselineAudit(scope, current)?.id ?? null).toBe(expected)
  })

  it('labels a second run of a date as a re-run', () => {
    expect(scope.filter((x) => isRerun(scope, x)).map((x) => x.id)).toEqual(['e', 'c'])
  })

  it('charts one point per date, the last run for it', () => {
    expect(onePerDate(scope).map((x) => x.id)).toEqual(['a', 'c', 'e'])
    // the board charts the published ones only
    expect(onePerDate(scope.filter((x) => x.published)).map((x) => x.id)).toEqual(['a', 'b', 'd'])
  })
})

describe('the baseline and the trend do not depend on the order audits are listed in', () => {
  // Hand-made: two runs of one date and a later draft; product brief, "Privacy and trust": the
  // change a board reads is measured from the last run of the earlier date.
  const audit = (id: string, asOf: string, createdAt: number | string, published = false) => ({
    id,
    asOf,
    createdAt,
    published,
  })
  const first = audit('first', '2025-06-30', 2)
  const second = audit('second', '2025-06-30', 3)
  const later = audit('later', '2025-09-30', 4)

  it.each([
    ['first run listed first', [first, second, later]],
    ['second run listed first', [second, first, later]],
  ])('measures from the last run of the earlier date, %s', (_name, scope) => {
    expect(baselineAudit(scope, later)?.id).toBe('second')
    expect(onePerDate(scope).map((x) => x.id)).toEqual(['second', 'later'])
  })

  it('compares creation times given as ISO text as well as numbers', () => {
    const a = audit('a', '2025-06-30', '2025-07-01T09:00:00.000Z')
    const b = audit('b', '2025-06-30', '2025-07-01T10:00:00.000Z')
    const c = audit('c', '2025-09-30', '2025-10-01T09:00:00.000Z')
    expect(baselineAudit([b, a, c], c)?.id).toBe('b')
    expect(isRerun([a, b], b)).toBe(true)
    expect(isRerun([a, b], a)).toBe(false)
  })

  it('keeps the first listed of two audits created at the same moment for one date', () => {
    // Array.prototype.sort is stable (ECMAScript 2019): a full tie keeps the listed order, and
    // the trend keeps the last of the date; the baseline scan keeps the first it met.
    const x = audit('x', '2025-06-30', 2)
    const y = audit('y', '2025-06-30', 2)
    expect(baselineAudit([x, y, later], later)?.id).toBe('x')
    expect(onePerDate([x, y]).map((a) => a.id)).toEqual(['y'])
    expect(onePerDate([y, x]).map((a) => a.id)).toEqual(['x'])
  })
})

describe('the change of each headline figure', () => {
  const headline = (over: Partial<AuditHeadline>): Pick<AuditResult, 'headline'> => ({
    headline: {
      athleteCount: 4,
      clubFrontLag: 0.5,
      clubBackLag: 0.25,
      balanceRatio: 0.8,
      squadFrontLags: {},
      squadsWithoutRecords: 0,
      catalogueGaps: 2,
      gapCount: 3,
      athletesWithGaps: 2,
      readinessAlerts: 1,
      ...over,
    },
  })

  it('subtracts every figure, each from its own', () => {
    const change = compareAudits(
      headline({}),
      headline({ clubBackLag: 0.75, readinessAlerts: 4, catalogueGaps: 1 }),
    )
    expect(change.clubBackLag).toEqual({ previous: 0.25, current: 0.75, change: 0.5 })
    expect(change.readinessAlerts).toEqual({ previous: 1, current: 4, change: 3 })
    expect(change.catalogueGaps).toEqual({ previous: 2, current: 1, change: -1 })
    expect(change.clubFrontLag).toEqual({ previous: 0.5, current: 0.5, change: 0 })
  })

  it('has no change for a figure that has no data now, and lists every squad in id order', () => {
    const change = compareAudits(
      headline({ squadFrontLags: { 'squad-z': 0.5, 'squad-b': 0.25 }, clubFrontLag: 0.5 }),
      headline({ squadFrontLags: { 'squad-a': 0.5, 'squad-z': null }, clubFrontLag: null }),
    )
    expect(change.clubFrontLag).toEqual({ previous: 0.5, current: null, change: null })
    expect(Object.keys(change.squadFrontLags)).toEqual(['squad-a', 'squad-b', 'squad-z'])
    expect(change.squadFrontLags['squad-z']).toEqual({ previous: 0.5, current: null, change: null })
    expect(change.squadFrontLags['squad-b']).toEqual({
      previous: 0.25,
      current: null,
      change: null,
    })
  })

  it('keeps only the figures of a result, no athlete', () => {
    const result = runAudit(inputs)
    expect(auditFigures(result)).toEqual({ headline: result.headline, squads: result.squads })
    expect(Object.keys(auditFigures(result))).toEqual(['headline', 'squads'])
  })
})
