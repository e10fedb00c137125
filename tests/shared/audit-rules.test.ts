// Rules of the audit that the worked example in audit.test.ts leaves open: the club's own age
// thresholds, boundaries of the readiness forecast, non-salto elements, the order of tied gaps
// and the per-squad counts. Each case is worked by hand beside it; the formulas are the product
// brief's, the weights and thresholds common practice (no published source).
import { beforeEach, describe, expect, it } from 'vitest'
import { defaultAgeThresholds, type AgeThresholdTable } from '../../shared/domain/age-categories.ts'
import { auditInputHash } from '../../shared/domain/audit/hashing.ts'
import { requirementCandidates } from '../../shared/domain/audit/readiness.ts'
import { runAudit } from '../../shared/domain/audit/run.ts'
import type {
  AuditAthlete,
  AuditResult,
  RequirementProfile,
} from '../../shared/domain/audit/types.ts'
import { asOf, athletes, el, elements, inputs, rec, records } from '../support/audit-example.ts'

// A club that moves its women's artistic bands a year earlier than the seeded FIG ones (FIG
// Technical Regulations 2025, Section 1, 6.1 — from memory: juniors 14–15, seniors from 16).
const earlierBands: AgeThresholdTable = {
  ...defaultAgeThresholds,
  'artistic-women': { juniorFromAge: 13, seniorFromAge: 15, source: 'the club’s own (example)' },
}

describe('an audit with the club’s own age thresholds', () => {
  it('finds the category changes by the club’s bands, not the seeded ones', () => {
    // As of 2025-09-15, by the calendar-year rule (age = year − birth year):
    // seeded bands: ben (2012) turns 14 in 2026 → junior; dee (2010) turns 16 → senior.
    expect(runAudit(inputs).readiness.map((r) => [r.athleteId, r.to])).toEqual([
      ['ben', 'junior'],
      ['dee', 'senior'],
    ])
    // club bands: ana (2011) is 14 in 2025, a junior, and 15 in 2026, a senior; ben is a junior
    // in 2025 (13) and 2026 (14); dee is a senior already in 2025 (15). cai is men's: unchanged.
    const club = runAudit({ ...inputs, ageThresholds: earlierBands })
    expect(club.readiness.map((r) => [r.athleteId, r.from, r.to, r.startsOn])).toEqual([
      ['ana', 'junior', 'senior', '2026-01-01'],
    ])
    expect(club.headline.readinessAlerts).toBe(1)
  })

  it('hashes the thresholds with the inputs, the seeded ones when none are given', async () => {
    const seeded = await auditInputHash(inputs)
    expect(await auditInputHash({ ...inputs, ageThresholds: earlierBands })).not.toBe(seeded)
    expect(await auditInputHash({ ...inputs, ageThresholds: defaultAgeThresholds })).toBe(seeded)
  })
})

describe('readiness forecast on the boundary of the new category', () => {
  // dee needs 1 more step on the back tuck (step index 3 of 5) for "a salto backward"; she
  // becomes a senior on 2026-01-01, 108 days after 2025-09-15 (16 + 31 + 30 + 31 days).
  const backward = (pace: number) =>
    runAudit({ ...inputs, paces: { dee: pace } })
      .readiness.find((r) => r.athleteId === 'dee')!
      .requirements.find((r) => r.requirementId === 'salto-backward')!

  it('is on time when the forecast falls on the first day of the new category', () => {
    // 1 step at 30/108 steps per 30 days: 1 / (30/108) × 30 = 108 days → 2026-01-01
    expect(backward(30 / 108)).toMatchObject({ forecastOn: '2026-01-01', onTime: true })
  })

  it('is late one day after it', () => {
    // 1 / (30/109) × 30 = 109 days → 2026-01-02
    expect(backward(30 / 109)).toMatchObject({ forecastOn: '2026-01-02', onTime: false })
  })
})

describe('a requirement for a salto is never met by a handspring or a walkover', () => {
  // Worked example: an athlete competition-ready on a front walkover and a back handspring (no
  // salto: rotation class none) and on nothing else. FIG Women's Artistic Code of Points
  // 2022–2024, floor composition requirements: "a salto forward or sideward", "a salto backward".
  const floor = [
    el('fwo', 'forward', 'none', 'none', null, 3),
    el('bhs', 'backward', 'none', 'none', null, 3),
    el('ft', 'forward', 'single', 'none', null, 5),
    el('bt', 'backward', 'single', 'none', null, 5),
  ]
  const senior: AuditAthlete = {
    id: 'dee',
    squadId: 's',
    birthYear: 2010,
    discipline: 'artistic-women',
  }

  it('leaves them out of the candidates and suggests the salto', () => {
    const result = runAudit({
      asOf,
      elements: floor,
      athletes: [senior],
      records: [rec('dee', 'fwo', 2), rec('dee', 'bhs', 2)],
    })
    const byId = Object.fromEntries(
      result.readiness[0]!.requirements.map((r) => [r.requirementId, r]),
    )
    expect(byId['salto-forward-sideward']).toMatchObject({ met: false, elementId: 'ft' })
    expect(byId['salto-backward']).toMatchObject({ met: false, elementId: 'bt' })
    // nor is a twist or a double found among them
    expect(byId['salto-full-twist']).toMatchObject({ noMatchingElement: true, elementId: null })
    expect(byId['double-salto']).toMatchObject({ noMatchingElement: true, elementId: null })
  })

  it('keeps them out whatever their direction', () => {
    const profile = { apparatus: 'floor' }
    const salto = { matches: { minRotationClass: 'single' as const } }
    expect(requirementCandidates(profile, salto, floor)).toEqual([2, 3])
    // a requirement without a rotation class (any element of the direction) takes them
    const anyForward = { matches: { direction: 'forward' as const } }
    expect(requirementCandidates(profile, anyForward, floor)).toEqual([0, 2])
  })
})

describe('requirements with a step of their own and short progressions', () => {
  // A club profile for the senior category (hand-worked example): a back tuck to step 3 or
  // above (index 2), a front tuck to step 5 or above on a progression of 3 steps (capped to its
  // last step), and any double salto.
  const profile: RequirementProfile = {
    id: 'club-senior',
    label: 'Club senior floor',
    discipline: 'artistic-women',
    apparatus: 'floor',
    categories: ['senior'],
    source: 'hand-worked example',
    requirements: [
      {
        id: 'back-step-3',
        label: 'Back tuck, step 3 or above',
        source: 'example',
        matches: { direction: 'backward', minRotationClass: 'single' },
        minStepIndex: 2,
      },
      {
        id: 'front-step-5',
        label: 'Front tuck, step 5 or above',
        source: 'example',
        matches: { direction: 'forward', minRotationClass: 'single' },
        minStepIndex: 4,
      },
      {
        id: 'double',
        label: 'A double salto',
        source: 'example',
        matches: { minRotationClass: 'double' },
        minStepIndex: 'competition-ready',
      },
    ],
  }
  const dee: AuditAthlete = {
    id: 'dee',
    squadId: 's',
    birthYear: 2010,
    discipline: 'artistic-women',
  }
  const audit = (recs: [string, number][], floor = elements) =>
    Object.fromEntries(
      runAudit({
        asOf,
        elements: floor,
        athletes: [dee],
        records: recs.map(([e, s]) => rec('dee', e, s)),
        profiles: [profile],
        paces: { dee: 1 },
      }).readiness[0]!.requirements.map((r) => [r.requirementId, r]),
    )

  it('is met exactly at the step asked for, not one below', () => {
    // bt at index 2 meets "step 3 or above"; at index 1 it needs 1 more step
    expect(audit([['bt', 2]])['back-step-3']).toMatchObject({ met: true, targetStepIndex: 2 })
    expect(audit([['bt', 1]])['back-step-3']).toMatchObject({
      met: false,
      targetStepIndex: 2,
      stepsNeeded: 1,
      forecastOn: '2025-10-15', // 1 step at 1 step per 30 days
    })
  })

  it('caps the step asked for at the last step of a shorter progression', () => {
    // a front tuck of 3 steps: "step 5 or above" means its last step, index 2
    const short = [el('ft', 'forward', 'single', 'none', null, 3)]
    expect(audit([['ft', 2]], short)['front-step-5']).toMatchObject({
      met: true,
      targetStepIndex: 2,
    })
    expect(audit([['ft', 1]], short)['front-step-5']).toMatchObject({
      met: false,
      stepsNeeded: 1,
    })
  })

  it('counts a one-step progression as one step to climb, and met once started', () => {
    const oneStep = [el('dbt', 'backward', 'double', 'none', null, 1)]
    expect(audit([], oneStep)['double']).toMatchObject({
      met: false,
      elementId: 'dbt',
      stepIndex: null,
      targetStepIndex: 0,
      stepsNeeded: 1,
    })
    expect(audit([['dbt', 0]], oneStep)['double']).toMatchObject({ met: true, stepsNeeded: 0 })
  })

  it('skips an element with no progression at all', () => {
    const noSteps = [el('dbt', 'backward', 'double', 'none', null, 0)]
    expect(audit([], noSteps)['double']).toMatchObject({
      noMatchingElement: true,
      elementId: null,
      stepsNeeded: 0,
      forecastOn: null,
      onTime: null,
    })
  })

  it('takes the profile of the athlete’s discipline and next category only', () => {
    const juniorOnly = { ...profile, categories: ['junior' as const] }
    const mens = { ...profile, discipline: 'artistic-men' as const }
    const result = runAudit({
      asOf,
      elements,
      athletes: [dee],
      records: [],
      profiles: [juniorOnly, mens],
    })
    expect(result.readiness[0]).toMatchObject({ to: 'senior', profileId: null, missingCount: 0 })
  })
})

describe('gaps of one athlete that tie', () => {
  // One athlete; counterparts exist, so every gap is the athlete's (common practice weights:
  // single 1, double 2).
  const floor = [
    el('bt', 'backward', 'single', 'none', 'ft', 5),
    el('ft', 'forward', 'single', 'none', 'bt', 5),
    el('bp', 'backward', 'single', 'none', 'fp', 5),
    el('fp', 'forward', 'single', 'none', 'bp', 5),
    el('bdt', 'backward', 'double', 'none', 'fdt', 5),
    el('fdt', 'forward', 'double', 'none', 'bdt', 5),
  ]
  const gapsOf = (recs: [string, string, number][], people = ['amy']) =>
    runAudit({
      asOf,
      elements: floor,
      athletes: people.map((id) => ({
        id,
        squadId: 's',
        birthYear: 2016,
        discipline: 'artistic-women' as const,
      })),
      records: recs.map(([a, e, s]) => rec(a, e, s)),
    }).gaps.map((g) => [g.athleteId, g.elementId, g.deficitSteps, g.weightedDeficit])

  it('puts the larger deficit first when the weighted deficits tie', () => {
    // bdt 3 vs fdt 1: 2 steps × double 2 = 4; bt 4 vs ft 0: 4 steps × single 1 = 4
    expect(
      gapsOf([
        ['amy', 'bdt', 3],
        ['amy', 'fdt', 1],
        ['amy', 'bt', 4],
        ['amy', 'ft', 0],
      ]),
    ).toEqual([
      ['amy', 'bt', 4, 4],
      ['amy', 'bdt', 2, 4],
    ])
  })

  it('orders gaps tied on every figure by element id', () => {
    // bt 3 vs ft 1 and bp 3 vs fp 1: 2 steps × 1 each
    expect(
      gapsOf([
        ['amy', 'bt', 3],
        ['amy', 'ft', 1],
        ['amy', 'bp', 3],
        ['amy', 'fp', 1],
      ]),
    ).toEqual([
      ['amy', 'bp', 2, 2],
      ['amy', 'bt', 2, 2],
    ])
  })

  it('orders by athlete before element', () => {
    expect(
      gapsOf(
        [
          ['zoe', 'bp', 3],
          ['zoe', 'fp', 1],
          ['amy', 'bt', 3],
          ['amy', 'ft', 1],
        ],
        ['zoe', 'amy'],
      ),
    ).toEqual([
      ['amy', 'bt', 2, 2],
      ['zoe', 'bp', 2, 2],
    ])
  })

  it('makes a gap at the threshold and none one step below it', () => {
    // bt 3 vs ft 2: 1 step, below the threshold of 2; counterpart started, so no gap
    expect(
      gapsOf([
        ['amy', 'bt', 3],
        ['amy', 'ft', 2],
      ]),
    ).toEqual([])
  })
})

describe('per-squad counts of athletes with gaps and of readiness alerts', () => {
  // The worked example plus eli in squad A: born 2016, no record, no category change. Squad A:
  // ana has a gap (bt), ben a readiness alert, eli neither; squad B: dee has both, cai neither.
  let result: AuditResult
  beforeEach(() => {
    result = runAudit({
      ...inputs,
      athletes: [
        ...athletes,
        { id: 'eli', squadId: 'squad-a', birthYear: 2016, discipline: 'artistic-women' },
      ],
      records,
    })
  })

  it('counts only the athletes who have them', () => {
    expect(
      result.squads.map((s) => [s.squadId, s.athleteCount, s.athletesWithGaps, s.readinessAlerts]),
    ).toEqual([
      ['squad-a', 3, 1, 1],
      ['squad-b', 2, 1, 1],
    ])
    expect(result.squads.map((s) => [s.squadId, s.athletesWithRecords])).toEqual([
      ['squad-a', 2],
      ['squad-b', 1],
    ])
    expect(result.headline.athletesWithGaps).toBe(2)
    expect(result.headline.readinessAlerts).toBe(2)
  })
})
