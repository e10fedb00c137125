import { beforeEach, describe, expect, it } from 'vitest'
import type { TimelinePoint } from '../../shared/domain/progress.ts'
import {
  replaceOutcomeAthleteId,
  visitOutcomes,
  type OutcomeRecommendation,
} from '../../shared/domain/visit-outcomes.ts'

// Worked example, computed by hand (rules in shared/domain/visit-outcomes.ts): one squad S of
// four athletes A, B, C, D; two elements E and F; the audit as of 30 June 2026.
//
// R1 accepted, A × E, made 10 May. A on E: step 1 since 1 March, step 2 logged on 10 May after
//    the recommendation, step 3 on 1 June. Before = end of 9 May = 1; at the audit = 3: moved.
// R2 declined, B × E, made 10 May. B on E: step 2 since 1 April; still 2: not moved, and not
//    among the accepted.
// R3 done, C × F, made 12 May. C paused with a lost skill and resumed stepped down to 1 on
//    20 May (highest stays 3). Before = 3; at the audit = 1: not moved (the step, not the
//    highest, counts).
// Accepted: R1 and R3 (done counts as accepted) = 2, of which moved: R1 = 1.
// Comparable, from the accepted ones: E for the squad's athletes no recommendation named on E
//    (C, D; A and B were named) from 10 May; F for A, B, D (C named) from 12 May: 5 in all.
//    C × E: never started: not moved. D × E: first step (0) on 15 May: moved (never started
//    counts as one below the first step). A × F: 2 since January: not moved. B × F: never
//    started: not moved. D × F: 1 on 11 May (the day before 12 May, so it is the baseline),
//    2 on 10 June: moved. Comparable moved = 2.
const S = 'squad-s'
const rec = (
  id: string,
  athleteId: string,
  elementId: string,
  status: OutcomeRecommendation['status'],
  madeOn: string,
): OutcomeRecommendation => ({
  id,
  squadId: S,
  athleteId,
  elementId,
  status,
  madeOn,
  suggestedStepIndex: 3,
})
const timelines = new Map<string, TimelinePoint[]>([
  [
    'A:E',
    [
      ['2026-03-01', 1, 1],
      ['2026-05-10', 2, 2],
      ['2026-06-01', 3, 3],
    ],
  ],
  ['B:E', [['2026-04-01', 2, 2]]],
  [
    'C:F',
    [
      ['2026-02-01', 3, 3],
      ['2026-05-20', 1, 3],
    ],
  ],
  ['D:E', [['2026-05-15', 0, 0]]],
  ['A:F', [['2026-01-01', 2, 2]]],
  [
    'D:F',
    [
      ['2026-05-11', 1, 1],
      ['2026-06-10', 2, 2],
    ],
  ],
])
const inputs = {
  asOf: '2026-06-30',
  recommendations: [
    rec('R3', 'C', 'F', 'done', '2026-05-12'),
    rec('R1', 'A', 'E', 'accepted', '2026-05-10'),
    rec('R2', 'B', 'E', 'declined', '2026-05-10'),
  ],
  timelines,
  athletesBySquad: new Map([[S, ['A', 'B', 'C', 'D']]]),
}

describe('visitOutcomes (worked example above)', () => {
  // In a hook, not while the file is collected: a throw fails the tests, not the collection, and
  // mutation testing sees which test runs which code.
  let result: ReturnType<typeof visitOutcomes>
  beforeEach(() => {
    result = visitOutcomes(inputs)
  })

  it.each([
    ['R1', 'accepted', 1, 3, true],
    ['R2', 'declined', 2, 2, false],
    ['R3', 'done', 3, 1, false],
  ] as const)(
    '%s (%s): step %i before, %i at the audit, moved %s',
    (id, status, before, after, moved) => {
      const row = result.recommendations.find((r) => r.recommendationId === id)!
      expect(row).toMatchObject({ status, stepBefore: before, stepAtAudit: after, moved })
    },
  )

  it('lists them by the day they were made', () => {
    expect(result.recommendations.map((r) => r.recommendationId)).toEqual(['R1', 'R2', 'R3'])
  })

  it('sums the accepted ones beside the comparable elements nobody recommended', () => {
    expect(result.summary).toEqual({
      accepted: 2,
      acceptedMoved: 1,
      comparable: 5,
      comparableMoved: 2,
    })
  })

  it('holds nothing comparable when nothing was accepted', () => {
    const none = visitOutcomes({ ...inputs, recommendations: [inputs.recommendations[2]!] })
    expect(none.summary).toEqual({
      accepted: 0,
      acceptedMoved: 0,
      comparable: 0,
      comparableMoved: 0,
    })
  })
})

describe('replaceOutcomeAthleteId', () => {
  it('replaces an erased athlete in the rows naming them, and says when none does', () => {
    const result = visitOutcomes(inputs)
    const replaced = replaceOutcomeAthleteId(result, 'A', 'X')!
    expect(replaced.recommendations.map((r) => r.athleteId)).toEqual(['X', 'B', 'C'])
    expect(replaceOutcomeAthleteId(result, 'D', 'X')).toBeNull()
  })
})
