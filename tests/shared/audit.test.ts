import { beforeEach, describe, expect, it } from 'vitest'
import { compareAudits } from '../../shared/domain/audit/comparison.ts'
import {
  balanceRatio,
  findCatalogueGaps,
  forecastDate,
  gapDeficit,
  lagFrom,
  proficiency,
} from '../../shared/domain/audit/formulas.ts'
import { auditInputHash, canonicalJson } from '../../shared/domain/audit/hashing.ts'
import { womensArtisticFloorProfile } from '../../shared/domain/audit/readiness.ts'
import { runAudit } from '../../shared/domain/audit/run.ts'
import type {
  AuditAthlete,
  AuditElement,
  AuditInputs,
  AuditProgress,
  AuditRecord,
  AuditResult,
} from '../../shared/domain/audit/types.ts'
import { asOf, athletes, el, elements, inputs, rec, records } from '../support/audit-example.ts'
// The formulas are the product brief's; the rotation weights and the gap threshold are common
// practice (no published source).

describe('audit formulas', () => {
  it.each<[number | null, number, number]>([
    [null, 5, 0],
    [0, 5, 0.2], // (0 + 1) / 5
    [4, 5, 1], // (4 + 1) / 5: competition-ready
    [9, 5, 1], // beyond the progression counts as its last step
    [2, 0, 0], // no progression, no proficiency
  ])('proficiency of step %s of %i steps is %d', (stepIndex, stepCount, expected) => {
    expect(proficiency(stepIndex, stepCount)).toBe(expected)
  })

  it.each([
    [1.1, 1.75, 1 - 1.1 / 1.75],
    [0.5, 0.5, 0], // a tie: the counterpart fully keeps up
    [0, 0.8, 1], // nothing mirrored
    [0, 0, 0], // no progress in that direction
  ])('lag with mirrored %d of %d is %d', (mirrored, total, expected) => {
    expect(lagFrom(mirrored, total)).toBeCloseTo(expected, 12)
  })

  it.each([
    [1.5, 1.75, 6 / 7],
    [0, 0.8, 0],
    [1.1, 0, null], // no backward proficiency: no finite ratio
  ])('balance ratio of %d forward to %d backward is %s', (forward, backward, expected) => {
    const ratio = balanceRatio(forward, backward)
    if (expected === null) expect(ratio).toBeNull()
    else expect(ratio).toBeCloseTo(expected, 12)
  })

  it.each<[string, number, number, { stepIndex: number | null; stepCount: number } | null, number]>(
    [
      // target = ceil((4 + 1) × 5 / 5) − 1 = 4; 4 − 2 = 2
      [
        'equal progressions: the difference of step indices',
        4,
        5,
        { stepIndex: 2, stepCount: 5 },
        2,
      ],
      // both competition-ready: target = ceil(6 × 4 / 6) − 1 = 3; 3 − 3 = 0, though indices differ by 2
      [
        'both competition-ready on progressions of different length',
        5,
        6,
        { stepIndex: 3, stepCount: 4 },
        0,
      ],
      // target = ceil(3 × 4 / 6) − 1 = 1; 1 − 1 = 0
      ['half-way on both', 2, 6, { stepIndex: 1, stepCount: 4 }, 0],
      // target = ceil(6 × 3 / 8) − 1 = ceil(2.25) − 1 = 2; 2 − 0 = 2
      ['a shorter counterpart progression', 5, 8, { stepIndex: 0, stepCount: 3 }, 2],
      // never started sits at −1: target 3 − (−1) = 4
      ['a counterpart never started', 3, 5, { stepIndex: null, stepCount: 5 }, 4],
      // missing from the catalogue: the element's own steps reached, 1 + 1 = 2
      ['a counterpart missing from the catalogue', 1, 8, null, 2],
    ],
  )('gap deficit: %s', (_name, stepIndex, stepCount, counterpart, expected) => {
    expect(gapDeficit({ stepIndex, stepCount }, counterpart)).toBe(expected)
  })

  it.each<[string, number, number, string | null]>([
    // 4 / 1.5 × 30 = 80 days; 15 September + 80 days = 4 December
    ['2025-09-15', 4, 1.5, '2025-12-04'],
    // 1 / 1 × 30 = 30 days
    ['2025-01-01', 1, 1, '2025-01-31'],
    // 1 / 0.7 × 30 = 42.86, rounded up to 43 days
    ['2025-01-01', 1, 0.7, '2025-02-13'],
    ['2025-01-01', 3, 0, null],
    ['2025-01-01', 3, -0.5, null],
  ])(
    'forecast from %s for %i steps at %d steps per 30 days is %s',
    (from, steps, pace, expected) => {
      expect(forecastDate(from, steps, pace)).toBe(expected)
    },
  )

  it('lists backward elements without a counterpart in the catalogue as catalogue gaps', () => {
    expect(findCatalogueGaps(elements)).toEqual([
      { elementId: 'bdt', elementName: 'BDT', counterpartId: 'fdt' },
      { elementId: 'bwo', elementName: 'BWO', counterpartId: null },
    ])
  })
})

describe('runAudit', () => {
  // Run in a hook, not while the file is collected: a throw fails the tests, not the collection.
  // beforeEach rather than beforeAll so that mutation testing sees which test runs which code.
  let result: AuditResult
  beforeEach(() => {
    result = runAudit(inputs)
  })

  it.each([
    // ana backward: Σp = bt 1 + bf 0.5 + bdt 0.25 = 1.75;
    //   mirrored = min(1, 0.6) + min(0.5, 0.5) + 0 (fdt missing) = 1.1; L = 1 − 1.1 / 1.75 = 0.3714
    // ana forward: Σp = ft 0.6 + ff 0.5 = 1.1; mirrored = min(0.6, 1) + min(0.5, 0.5) = 1.1; 0
    ['ana', 1 - 1.1 / 1.75, 0, 1.1, 1.75],
    // ben has no backward progress: front-lag 0; forward 0.4 with nothing mirrored: back-lag 1
    ['ben', 0, 1, 0.4, 0],
    // cai has no progress in either direction
    ['cai', 0, 0, 0, 0],
    // dee backward: 0.8 + 0.25 + 2/3 = 103/60; nothing mirrored: front-lag 1
    ['dee', 1, 0, 0, 103 / 60],
  ])('athlete %s has front-lag %d and back-lag %d', (id, frontLag, backLag, forward, backward) => {
    const row = result.athletes.find((a) => a.athleteId === id)
    expect(row?.frontLag).toBeCloseTo(frontLag, 12)
    expect(row?.backLag).toBeCloseTo(backLag, 12)
    expect(row?.forwardProficiency).toBeCloseTo(forward, 12)
    expect(row?.backwardProficiency).toBeCloseTo(backward, 12)
  })

  it('weights the squad lag by mass, not as a mean of the athletes’ ratios', () => {
    const a = result.squads.find((s) => s.squadId === 'squad-a')
    // squad A: 1 − (1.1 + 0) / (1.75 + 0) = 0.3714; a mean of ratios would give (0.3714 + 0) / 2
    expect(a?.frontLag).toBeCloseTo(1 - 1.1 / 1.75, 12)
    expect(a?.frontLag).not.toBeCloseTo((1 - 1.1 / 1.75) / 2, 3)
    // back-lag: 1 − (1.1 + 0) / (1.1 + 0.4) = 4/15
    expect(a?.backLag).toBeCloseTo(4 / 15, 12)
    // balance: (1.1 + 0.4) / 1.75 = 6/7
    expect(a?.balanceRatio).toBeCloseTo(6 / 7, 12)
    expect(a?.athleteCount).toBe(2)
  })

  it('gives squad B, with no forward progress, full front-lag and a balance ratio of 0', () => {
    const b = result.squads.find((s) => s.squadId === 'squad-b')
    // 1 − 0 / (103/60) = 1; back-lag 0 since there is no forward progress; 0 / (103/60) = 0
    expect(b).toMatchObject({ frontLag: 1, backLag: 0, balanceRatio: 0, athleteCount: 2 })
  })

  it('computes the headline figures over every athlete in scope', () => {
    // backward mass: 1.75 + 103/60 = 208/60 = 52/15; mirrored 1.1
    // club front-lag: 1 − 1.1 / (52/15) = 1 − 16.5/52 = 71/104 = 0.6827
    // club back-lag: 1 − 1.1 / 1.5 = 4/15; balance: 1.5 / (52/15) = 22.5/52 = 45/104
    const h = result.headline
    expect(h.athleteCount).toBe(4)
    expect(h.clubFrontLag).toBeCloseTo(71 / 104, 12)
    expect(h.clubBackLag).toBeCloseTo(4 / 15, 12)
    expect(h.balanceRatio).toBeCloseTo(45 / 104, 12)
    expect(h.squadFrontLags['squad-a']).toBeCloseTo(1 - 1.1 / 1.75, 12)
    expect(h.squadFrontLags['squad-b']).toBe(1)
    expect(h.catalogueGaps).toBe(2)
    // dee bt, ana bt, dee bp; ana bdt and dee bwo wait for the catalogue and are counted there
    expect(h.gapCount).toBe(3)
    expect(h.athletesWithGaps).toBe(2)
    expect(result.catalogueGaps.map((c) => [c.elementId, c.athleteCount])).toEqual([
      ['bdt', 1], // ana
      ['bwo', 1], // dee
    ])
    expect(h.readinessAlerts).toBe(2)
  })

  it('has no balance ratio for a scope with no backward proficiency', () => {
    const onlyForward = runAudit({ ...inputs, athletes: athletes.slice(1, 2) })
    expect(onlyForward.headline.balanceRatio).toBeNull()
    expect(onlyForward.headline.clubFrontLag).toBe(0)
    expect(onlyForward.headline.clubBackLag).toBe(1)
  })

  it('ranks gaps by the deficit weighted by rotation class, ties by the larger deficit, the catalogue’s last', () => {
    expect(
      result.gaps.map((g) => [g.athleteId, g.elementId, g.deficitSteps, g.weightedDeficit]),
    ).toEqual([
      // dee bt: counterpart ft never started: target 3 − (−1) = 4 steps × single 1 = 4
      ['dee', 'bt', 4, 4],
      // ana bt: 4 − 2 = 2 steps, at the threshold × single 1 = 2
      ['ana', 'bt', 2, 2],
      // dee bp: fp never started, 1 step below the threshold but never started × single 1 = 1
      ['dee', 'bp', 1, 1],
      // Then the gaps the catalogue must close, however large:
      // ana bdt: counterpart missing: 2 steps reached × double 2 = 4 (above ana bt, ranked below)
      ['ana', 'bdt', 2, 4],
      // dee bwo: no counterpart: 2 steps × none 0.5 = 1
      ['dee', 'bwo', 2, 1],
    ])
    // ana bf against ff (deficit 0) is no gap
    expect(result.gaps.some((g) => g.elementId === 'bf')).toBe(false)
  })

  it('flags a counterpart missing from the catalogue and one never started', () => {
    const missing = result.gaps.find((g) => g.elementId === 'bdt')
    expect(missing).toMatchObject({
      counterpartId: 'fdt',
      counterpartName: null,
      counterpartMissing: true,
      counterpartNeverStarted: false,
      counterpartStepIndex: null,
      rotationClass: 'double',
      weight: 2,
    })
    const notStarted = result.gaps.find((g) => g.athleteId === 'dee' && g.elementId === 'bt')
    expect(notStarted).toMatchObject({
      counterpartName: 'FT',
      counterpartMissing: false,
      counterpartNeverStarted: true,
      stepIndex: 3,
    })
  })

  it('orders gaps that tie on every figure by athlete', () => {
    const twins = runAudit({
      asOf,
      elements,
      athletes: [
        { id: 'zoe', squadId: 's', birthYear: 2016, discipline: 'artistic-women' },
        { id: 'amy', squadId: 's', birthYear: 2016, discipline: 'artistic-women' },
      ],
      records: [rec('zoe', 'bt', 4), rec('zoe', 'ft', 1), rec('amy', 'bt', 4), rec('amy', 'ft', 1)],
    })
    // both: 4 − 1 = 3 steps × 1
    expect(twins.gaps.map((g) => [g.athleteId, g.weightedDeficit])).toEqual([
      ['amy', 3],
      ['zoe', 3],
    ])
  })

  it('follows the configured threshold and weights', () => {
    const strict = runAudit(inputs, {
      gapThresholdSteps: 3,
      rotationWeights: { none: 1, single: 1, double: 1, triple: 1 },
    })
    // ana bt (2 steps) drops out; never-started and missing counterparts stay
    expect(strict.gaps.map((g) => [g.athleteId, g.elementId, g.weightedDeficit])).toEqual([
      ['dee', 'bt', 4],
      ['dee', 'bp', 1],
      ['ana', 'bdt', 2],
      ['dee', 'bwo', 2],
    ])
  })

  it('counts gaps per squad', () => {
    expect(result.squads.map((s) => [s.squadId, s.gapCount, s.athletesWithGaps])).toEqual([
      // ana bt (ana bdt is the catalogue's); dee bt and dee bp (dee bwo is the catalogue's)
      ['squad-a', 1, 1],
      ['squad-b', 2, 1],
    ])
  })

  it.each([
    // forward best: ana 0.6 (ft), ben 0.4 (ft), cai 0, dee 0 → 1.0 / 4 = 0.25 (fp: nobody)
    // backward best: ana max(bt 1) = 1, dee max(bt 0.8, bp 0.25) = 0.8 → 1.8 / 4 = 0.45
    ['single', 'none', 0.25, 2, 0.45, 2],
    // forward ff: ana 0.5 → 0.125; backward bf: ana 0.5 → 0.125
    ['single', 'full', 0.125, 1, 0.125, 1],
    // backward bdt: ana 0.25 → 0.0625; no forward double in the catalogue
    ['double', 'none', 0, 0, 0.0625, 1],
    // backward bwo: dee 2/3 → 1/6
    ['none', 'none', 0, 0, 1 / 6, 1],
    ['triple', 'more', 0, 0, 0, 0],
  ] as const)(
    'coverage of %s salto, %s twist: forward %d over %i elements, backward %d over %i',
    (rotationClass, twistBand, forward, forwardCount, backward, backwardCount) => {
      const cell = result.coverage.find(
        (c) => c.rotationClass === rotationClass && c.twistBand === twistBand,
      )
      expect(cell?.forward.mean).toBeCloseTo(forward, 12)
      expect(cell?.forward.elementCount).toBe(forwardCount)
      expect(cell?.backward.mean).toBeCloseTo(backward, 12)
      expect(cell?.backward.elementCount).toBe(backwardCount)
    },
  )

  it('has a cell for every rotation class and twist band', () => {
    expect(result.coverage).toHaveLength(16)
  })

  describe('readiness', () => {
    // As of 2025-09-15 with a 12-month horizon, by the FIG calendar-year rule (FIG Technical
    // Regulations 2025, Section 1, 6.1 — from memory): dee (2010) turns 16 in 2026 and becomes a
    // senior, ben (2012) turns 14 and becomes a junior; ana (2011) stays junior, cai (2013, men's)
    // stays age-group. The profile is the FIG Women's Artistic Code of Points 2022–2024 floor
    // composition requirements.
    it('lists the athletes whose category changes within the horizon', () => {
      expect(result.readiness.map((r) => [r.athleteId, r.from, r.to, r.startsOn])).toEqual([
        ['ben', 'age-group', 'junior', '2026-01-01'],
        ['dee', 'junior', 'senior', '2026-01-01'],
      ])
      expect(result.readiness.every((r) => r.profileId === womensArtisticFloorProfile.id)).toBe(
        true,
      )
    })

    it('forecasts each missing requirement at the athlete’s pace', () => {
      const dee = result.readiness.find((r) => r.athleteId === 'dee')
      expect(
        dee?.requirements.map((r) => [
          r.requirementId,
          r.elementId,
          r.stepsNeeded,
          r.forecastOn,
          r.onTime,
        ]),
      ).toEqual([
        // nearest full twist: ff (4 steps, never started) needs 4; 4 / 1.5 × 30 = 80 days
        ['salto-full-twist', 'ff', 4, '2025-12-04', true],
        // only bdt (8 steps) is a double: 8 / 1.5 × 30 = 160 days → 22 February, after 1 January
        ['double-salto', 'bdt', 8, '2026-02-22', false],
        // the untwisted singles come first: fp and ss (4 steps) need 4, ft (5 steps) 5; of the
        // two nearest the lowest id, fp, is shown (ff, a full twist, is further); 80 days
        ['salto-forward-sideward', 'fp', 4, '2025-12-04', true],
        // bt at step index 3 of 5 needs 1 more; 1 / 1.5 × 30 = 20 days
        ['salto-backward', 'bt', 1, '2025-10-05', true],
      ])
      expect(dee?.missingCount).toBe(4)
      expect(dee?.requirements[0]?.source).toContain('Code of Points 2022–2024')
    })

    it('meets a requirement with a sideward salto and has no forecast at zero pace', () => {
      const ben = result.readiness.find((r) => r.athleteId === 'ben')
      const forward = ben?.requirements.find((r) => r.requirementId === 'salto-forward-sideward')
      // ss at its last step (3 of 0–3) is competition-ready
      expect(forward).toMatchObject({
        met: true,
        elementId: 'ss',
        stepsNeeded: 0,
        forecastOn: null,
      })
      // ben has no pace in the inputs: counted as 0, so no date
      expect(ben?.pace).toBe(0)
      expect(ben?.requirements.filter((r) => !r.met).map((r) => r.forecastOn)).toEqual([
        null,
        null,
        null,
      ])
      expect(ben?.missingCount).toBe(3)
    })

    it('says when no catalogue element can meet a requirement', () => {
      const noDoubles = runAudit({
        ...inputs,
        elements: elements.filter((e) => e.rotationClass !== 'double'),
      })
      const double = noDoubles.readiness
        .find((r) => r.athleteId === 'dee')
        ?.requirements.find((r) => r.requirementId === 'double-salto')
      expect(double).toMatchObject({ met: false, noMatchingElement: true, forecastOn: null })
    })

    it('shows a change without a profile, which is not an alert', () => {
      // tumbling juniors from 13 (FIG Technical Regulations 2025, Section 1 — from memory)
      const tumbler = runAudit({
        asOf,
        elements,
        athletes: [{ id: 'eve', squadId: 's', birthYear: 2013, discipline: 'tumbling' }],
        records: [],
      })
      expect(tumbler.readiness).toEqual([
        expect.objectContaining({
          athleteId: 'eve',
          to: 'junior',
          profileId: null,
          missingCount: 0,
        }),
      ])
      expect(tumbler.headline.readinessAlerts).toBe(0)
    })
  })

  it('does not depend on the order of its inputs', () => {
    const shuffled = runAudit({
      ...inputs,
      elements: [...elements].reverse(),
      athletes: [...athletes].reverse(),
      records: [...records].reverse(),
    })
    expect(shuffled).toEqual(result)
  })

  it('counts duplicate records of a pair as the highest and ignores unknown ones', () => {
    const messy = runAudit({
      ...inputs,
      records: [...records, rec('ana', 'ft', 0), rec('ghost', 'bt', 4), rec('ana', 'gone', 2)],
    })
    expect(messy.headline).toEqual(result.headline)
  })

  it('rejects two elements with one id', () => {
    expect(() =>
      runAudit({
        ...inputs,
        elements: [...elements, el('bt', 'forward', 'single', 'none', null, 3)],
      }),
    ).toThrow('Two elements share the id bt.')
  })

  it('reports its progress up to done', () => {
    const seen: AuditProgress[] = []
    runAudit(inputs, {}, (p) => seen.push(p))
    expect(seen.map((p) => p.phase)).toEqual([
      'records',
      'records',
      'athletes',
      'athletes',
      'athletes',
      'athletes',
      'gaps',
      'gaps',
      'readiness',
      'done',
    ])
    expect(seen.find((p) => p.phase === 'athletes' && p.done === 4)?.total).toBe(4)
  })

  // Its speed is measured by bench/audit.bench.ts, not asserted here.
  it('audits a club of 1,000 athletes × 300 elements (100,000 records)', () => {
    const big: AuditElement[] = []
    for (let i = 0; i < 150; i++) {
      const rotation = (['single', 'double', 'triple', 'none'] as const)[i % 4]!
      const twist = (['none', 'half', 'full', 'more'] as const)[i % 4]!
      big.push(el(`b${i}`, 'backward', rotation, twist, `f${i}`, 4 + (i % 5)))
      big.push(el(`f${i}`, 'forward', rotation, twist, `b${i}`, 4 + ((i + 2) % 5)))
    }
    const squadAthletes: AuditAthlete[] = Array.from({ length: 1000 }, (_, i) => ({
      id: `a${i}`,
      squadId: `s${i % 10}`,
      birthYear: 2008 + (i % 10),
      discipline: 'artistic-women',
    }))
    const bigRecords: AuditRecord[] = []
    for (let a = 0; a < 1000; a++) {
      for (let k = 0; k < 100; k++) {
        const e = big[(a * 7 + k * 3) % big.length]!
        bigRecords.push(rec(`a${a}`, e.id, (a + k) % e.stepCount))
      }
    }
    const out = runAudit({ asOf, elements: big, athletes: squadAthletes, records: bigRecords })
    expect(out.athletes).toHaveLength(1000)
    expect(out.squads).toHaveLength(10)
  })
})

describe('compareAudits', () => {
  it('gives the change of each headline figure', () => {
    const before = runAudit(inputs)
    // dee starts the front tuck at step index 3 (p = 0.8) and a new squad C appears
    const after = runAudit({
      ...inputs,
      athletes: [
        ...athletes,
        { id: 'fay', squadId: 'squad-c', birthYear: 2016, discipline: 'artistic-women' },
      ],
      records: [...records, rec('dee', 'ft', 3)],
    })
    const change = compareAudits(before, after)
    // club front-lag: before 71/104; after 1 − (1.1 + min(0.8, 0.8)) / (52/15) = 1 − 28.5/52 = 47/104
    expect(change.clubFrontLag.previous).toBeCloseTo(71 / 104, 12)
    expect(change.clubFrontLag.current).toBeCloseTo(47 / 104, 12)
    expect(change.clubFrontLag.change).toBeCloseTo(-24 / 104, 12)
    // balance: (1.5 + 0.8) / (52/15) = 34.5/52 = 69/104, up from 45/104
    expect(change.balanceRatio.change).toBeCloseTo(24 / 104, 12)
    // dee's back tuck gap closes: 3 → 2 gaps
    expect(change.gapCount).toEqual({ previous: 3, current: 2, change: -1 })
    expect(change.athletesWithGaps).toEqual({ previous: 2, current: 2, change: 0 })
    expect(change.athleteCount).toEqual({ previous: 4, current: 5, change: 1 })
    // squad B front-lag: 1 → 1 − 0.8 / (103/60) = 1 − 48/103 = 55/103
    expect(change.squadFrontLags['squad-b']?.current).toBeCloseTo(55 / 103, 12)
    expect(change.squadFrontLags['squad-b']?.change).toBeCloseTo(55 / 103 - 1, 12)
    // squad C's only athlete has no record yet: no data, not a front-lag of 0
    expect(change.squadFrontLags['squad-c']).toEqual({
      previous: null,
      current: null,
      change: null,
    })
  })

  it('has no previous figures for a first audit', () => {
    const change = compareAudits(null, runAudit(inputs))
    expect(change.catalogueGaps).toEqual({ previous: null, current: 2, change: null })
    expect(change.squadFrontLags['squad-b']).toEqual({ previous: null, current: 1, change: null })
  })
})

describe('auditInputHash', () => {
  it('is the same for the same inputs in any order', async () => {
    const reordered: AuditInputs = {
      paces: { dee: 1.5 },
      records: [...records]
        .reverse()
        .map((r) => ({ stepIndex: r.stepIndex, elementId: r.elementId, athleteId: r.athleteId })),
      athletes: [...athletes].reverse(),
      elements: [...elements].sort((a, b) => (a.name < b.name ? 1 : -1)),
      asOf,
    }
    const hash = await auditInputHash(inputs)
    expect(hash).toMatch(/^[0-9a-f]{64}$/)
    expect(await auditInputHash(reordered)).toBe(hash)
  })

  it('changes when a record changes', async () => {
    const changed = {
      ...inputs,
      records: records.map((r, i) => (i === 0 ? { ...r, stepIndex: 3 } : r)),
    }
    expect(await auditInputHash(changed)).not.toBe(await auditInputHash(inputs))
  })

  it('covers the as-of date, the paces and the options, with defaults filled in', async () => {
    const hash = await auditInputHash(inputs)
    expect(await auditInputHash({ ...inputs, asOf: '2025-09-16' })).not.toBe(hash)
    expect(await auditInputHash({ ...inputs, paces: { dee: 1 } })).not.toBe(hash)
    expect(await auditInputHash(inputs, { gapThresholdSteps: 3 })).not.toBe(hash)
    expect(await auditInputHash(inputs, { gapThresholdSteps: 2, horizonMonths: 12 })).toBe(hash)
    expect(await auditInputHash({ ...inputs, profiles: [womensArtisticFloorProfile] })).toBe(hash)
  })

  it('canonicalises keys and arrays', () => {
    expect(canonicalJson({ b: [3, 1, 2], a: { d: undefined, c: 'x' } })).toBe(
      '{"a":{"c":"x"},"b":[1,2,3]}',
    )
  })

  // JSON text as RFC 8259 writes it, keys in UTF-16 code unit order: "10" before "9" before "b".
  it('writes a flat object the same whatever order its keys come in, number-like keys included', () => {
    const record = '{"athleteId":"a","elementId":"e","stepIndex":2}'
    expect(canonicalJson({ athleteId: 'a', elementId: 'e', stepIndex: 2 })).toBe(record)
    expect(canonicalJson({ stepIndex: 2, elementId: 'e', athleteId: 'a' })).toBe(record)
    // An object lists number-like keys first, in numeric order: 9, 10, then b.
    expect(canonicalJson({ b: null, 10: 'y', 9: 'x', a: undefined })).toBe(
      '{"10":"y","9":"x","b":null}',
    )
    expect(canonicalJson([{ b: 1, a: 2 }, { a: 1 }])).toBe('[{"a":1},{"a":2,"b":1}]')
  })
})
