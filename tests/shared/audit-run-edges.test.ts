// Edges of an audit run that the worked example does not reach: duplicate records, empty
// scopes, the order of squads, progress reports, and what the readiness rows say besides the
// element. Each case is worked by hand beside it (formulas from the product brief; the ordering
// of the readiness suggestion from shared/domain/audit/readiness.ts, common practice, no
// published source).
import { describe, expect, it } from 'vitest'
import {
  requirementCandidates,
  womensArtisticFloorProfile,
} from '../../shared/domain/audit/readiness.ts'
import { runAudit } from '../../shared/domain/audit/run.ts'
import type { AuditAthlete, AuditProgress } from '../../shared/domain/audit/types.ts'
import { asOf, el, elements, inputs, rec } from '../support/audit-example.ts'

const athlete = (id: string, squadId = 's', birthYear = 2016): AuditAthlete => ({
  id,
  squadId,
  birthYear,
  discipline: 'artistic-women',
})

describe('records and elements of an audit run', () => {
  it('takes the highest of several records of a pair, whichever comes last', () => {
    // ana bt at index 1 then 3: p = 4/5 = 0.8 either way round
    for (const order of [
      [rec('ana', 'bt', 1), rec('ana', 'bt', 3)],
      [rec('ana', 'bt', 3), rec('ana', 'bt', 1)],
    ]) {
      const result = runAudit({ asOf, elements, athletes: [athlete('ana')], records: order })
      expect(result.athletes[0]?.backwardProficiency).toBeCloseTo(0.8, 12)
    }
  })

  it('ignores a record below the first step, as one never started', () => {
    // a step index of −1 is no step: the athlete has no data, not a lag of 0 (product brief)
    const result = runAudit({
      asOf,
      elements,
      athletes: [athlete('amy')],
      records: [rec('amy', 'bt', -1)],
    })
    expect(result.athletes[0]).toMatchObject({ frontLag: null, backLag: null })
    expect(result.gaps).toEqual([])
  })

  it('rejects two athletes with one id', () => {
    expect(() => runAudit({ ...inputs, athletes: [athlete('x'), athlete('x', 't')] })).toThrow(
      'Two athletes share the id x.',
    )
  })

  it('reads the counterpart’s own step, wherever the counterpart is listed', () => {
    // "a-back" (index 0 once sorted) against "b-front" (index 1): 4 − 3 = 1 step, below the
    // threshold of 2 and started, so no gap
    const pair = [
      el('b-front', 'forward', 'single', 'none', 'a-back', 5),
      el('a-back', 'backward', 'single', 'none', 'b-front', 5),
    ]
    const records = [rec('amy', 'a-back', 4), rec('amy', 'b-front', 3)]
    expect(runAudit({ asOf, elements: pair, athletes: [athlete('amy')], records }).gaps).toEqual([])
    // at 1 on the front: 4 − 1 = 3 steps, a gap that names both progressions
    const behind = [rec('amy', 'a-back', 4), rec('amy', 'b-front', 1)]
    const [gap] = runAudit({
      asOf,
      elements: pair,
      athletes: [athlete('amy')],
      records: behind,
    }).gaps
    expect(gap).toMatchObject({
      elementId: 'a-back',
      counterpartStepIndex: 1,
      deficitSteps: 3,
      stepCount: 5,
      counterpartStepCount: 5,
    })
  })
})

describe('empty scopes and the order of squads', () => {
  it('has coverage means of 0, not NaN, with no athlete', () => {
    const result = runAudit({ asOf, elements, athletes: [], records: [] })
    expect(result.coverage.every((c) => c.forward.mean === 0 && c.backward.mean === 0)).toBe(true)
    expect(result.headline.athleteCount).toBe(0)
  })

  it('lists squads by id, not by the order their first athlete comes in', () => {
    // athletes are visited by id: "a" (squad z) before "b" (squad y)
    const result = runAudit({
      asOf,
      elements,
      athletes: [athlete('a', 'z'), athlete('b', 'y')],
      records: [],
    })
    expect(result.squads.map((s) => s.squadId)).toEqual(['y', 'z'])
  })
})

describe('progress reports while athletes are visited', () => {
  const athletesDone = (n: number) => {
    const seen: AuditProgress[] = []
    runAudit(
      {
        asOf,
        elements,
        athletes: Array.from({ length: n }, (_, i) => athlete(`a${i}`)),
        records: [],
      },
      {},
      (p) => seen.push(p),
    )
    return seen.filter((p) => p.phase === 'athletes').map((p) => p.done)
  }

  it('reports about every twentieth of the athletes, and the last one', () => {
    // 41 athletes: every ⌈41 / 20⌉ = 3, then 41
    expect(athletesDone(41)).toEqual([3, 6, 9, 12, 15, 18, 21, 24, 27, 30, 33, 36, 39, 41])
    // 40 athletes: every 2, the last one among them
    expect(athletesDone(40)).toEqual(Array.from({ length: 20 }, (_, i) => 2 * (i + 1)))
    // fewer than 20: each one
    expect(athletesDone(3)).toEqual([1, 2, 3])
  })
})

describe('what a readiness row says', () => {
  // dee (2010) becomes a senior on 2026-01-01 (FIG Technical Regulations 2025, Section 1, 6.1 —
  // from memory). Floor catalogue of a back full (single, full twist) and a double back tuck.
  const floor = [
    el('bf', 'backward', 'single', 'full', null, 8),
    el('dbt', 'backward', 'double', 'none', null, 3),
    el('ft', 'forward', 'single', 'none', null, 5),
  ]
  const rows = (records = [rec('dee', 'ft', 1)]) =>
    Object.fromEntries(
      runAudit({
        asOf,
        elements: floor,
        athletes: [athlete('dee', 's', 2010)],
        records,
        paces: {},
      }).readiness[0]!.requirements.map((r) => [r.requirementId, r]),
    )

  it('names the element suggested and says a match exists', () => {
    expect(rows()['salto-forward-sideward']).toMatchObject({
      elementId: 'ft',
      elementName: 'FT',
      stepIndex: 1,
      targetStepIndex: 4,
      stepsNeeded: 3,
      noMatchingElement: false,
      // no pace: no date, so no on-time either
      forecastOn: null,
      onTime: null,
    })
  })

  it('suggests the single salto with a twist before the double without one', () => {
    // "a salto backward": bf is level single/full (1 × 4 + 2 = 6), dbt double/none (2 × 4 = 8);
    // the simpler level comes first even though dbt has fewer steps to climb
    expect(rows()['salto-backward']).toMatchObject({ elementId: 'bf', stepsNeeded: 8 })
    const backward = womensArtisticFloorProfile.requirements.find((r) => r.id === 'salto-backward')!
    expect(requirementCandidates({ apparatus: 'floor' }, backward, floor)).toEqual([0, 1])
  })

  it('keeps candidates of one level in catalogue order, however many', () => {
    // 60 untwisted single back saltos, listed after a double: the double last, the singles in order
    const many = [
      el('double', 'backward', 'double', 'none', null, 3),
      ...Array.from({ length: 60 }, (_, i) => el(`s${i}`, 'backward', 'single', 'none', null, 5)),
    ]
    const backward = womensArtisticFloorProfile.requirements.find((r) => r.id === 'salto-backward')!
    expect(requirementCandidates({ apparatus: 'floor' }, backward, many)).toEqual([
      ...Array.from({ length: 60 }, (_, i) => i + 1),
      0,
    ])
  })
})

describe('the seeded women’s floor profile as shown', () => {
  // FIG Women's Artistic Gymnastics Code of Points 2022–2024, Section 13 Floor Exercise,
  // Composition Requirements (article number from memory)
  it('labels each requirement as the Code words it', () => {
    expect(womensArtisticFloorProfile.id).toBe('fig-wag-floor-2022')
    expect(womensArtisticFloorProfile.label).toBe(
      "Women's artistic floor: acrobatic composition requirements",
    )
    expect(womensArtisticFloorProfile.requirements.map((r) => r.label)).toEqual([
      'A salto with at least a full twist (360°)',
      'A double salto',
      'A salto forward or sideward',
      'A salto backward',
    ])
  })
})
