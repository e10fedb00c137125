import { beforeEach, describe, expect, it } from 'vitest'
import {
  baselineAudit,
  compareAudits,
  isRerun,
  onePerDate,
} from '../../shared/domain/audit/comparison.ts'
import { runAudit } from '../../shared/domain/audit/run.ts'
import type { AuditResult } from '../../shared/domain/audit/types.ts'
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
