import { uniformInt } from 'pure-rand/distribution/uniformInt'
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus'
import { describe, expect, it } from 'vitest'
import {
  packAuditResult,
  unpackAuditResult,
  type StoredAuditResult,
} from '../../server/services/audit-storage.ts'
import { runAudit } from '../../shared/domain/audit/run.ts'
import type {
  AuditAthlete,
  AuditElement,
  AuditInputs,
  AuditRecord,
  AuditResult,
  GapEntry,
} from '../../shared/domain/audit/types.ts'
import { asOf, athletes, inputs, rec, records } from '../support/audit-example.ts'

describe('the stored form of a result', () => {
  // What the database does to it: json is stored as written and parsed on reading.
  const throughJson = <T>(value: T): T => JSON.parse(JSON.stringify(value)) as T
  // The worked example's gaps rank dee bt, ana bdt, ana bt, dee bwo, dee bp: 0 and 2 share bt.
  const tamper = (result: AuditResult, change: Partial<GapEntry>, at = 0): AuditResult => ({
    ...result,
    gaps: result.gaps.map((g, i) => (i === at ? { ...g, ...change } : g)),
  })
  const expectRoundTrip = (result: AuditResult) => {
    const before = structuredClone(result)
    const packed = packAuditResult(result)
    expect(result).toStrictEqual(before)
    expect(packed.format).toBe(2)
    expect(unpackAuditResult(packed)).toStrictEqual(result)
    const stored = unpackAuditResult(throughJson(packed))
    expect(stored).toStrictEqual(result)
    // the same text, keys in the same order: an API answer does not change
    expect(JSON.stringify(stored)).toBe(JSON.stringify(result))
    return packed
  }

  const twoSquadsOneAthlete: AuditInputs = {
    ...inputs,
    athletes: [
      ...athletes,
      { id: 'eve', squadId: 'squad-c', birthYear: 2012, discipline: 'artistic-men' },
    ],
    records: [...records, rec('eve', 'bdt', 7), rec('eve', 'bf', 5), rec('eve', 'ff', 0)],
  }
  it.each<[string, AuditInputs, Parameters<typeof runAudit>[1]]>([
    ['the worked example', inputs, {}],
    [
      'the worked example with a stricter threshold and even weights',
      inputs,
      {
        gapThresholdSteps: 3,
        rotationWeights: { none: 1, single: 1, double: 1, triple: 1 },
      },
    ],
    // weights that are not exact in binary, so a product computed differently would differ
    [
      'the worked example with fractional weights',
      twoSquadsOneAthlete,
      {
        gapThresholdSteps: 1,
        rotationWeights: { none: 0.3, single: 1.1, double: 2.7, triple: 3.3 },
      },
    ],
    ['a scope with only forward progress', { ...inputs, athletes: athletes.slice(1, 2) }, {}],
    ['a scope with no athlete', { ...inputs, athletes: [], records: [] }, {}],
  ])('gives back %s as computed', (_name, auditInputs, options) => {
    expectRoundTrip(runAudit(auditInputs, options))
  })

  it('keeps the ranking, the missing and the never-started counterparts of the worked example', () => {
    const packed = packAuditResult(runAudit(inputs))
    // ana bdt: counterpart fdt named but not in the catalogue; dee bwo: no counterpart at all
    expect(packed.gapElements.map((e) => [e.id, e.counterpartId, e.counterpartName])).toEqual([
      ['bt', 'ft', 'FT'],
      ['bp', 'fp', 'FP'],
      ['bdt', 'fdt', null],
      ['bwo', null, null],
    ])
    const gaps = unpackAuditResult(packed).gaps
    expect(
      gaps.map((g) => [g.athleteId, g.elementId, g.counterpartMissing, g.counterpartNeverStarted]),
    ).toEqual([
      ['dee', 'bt', false, true],
      ['ana', 'bt', false, false],
      ['dee', 'bp', false, true],
      // the catalogue's gaps after the athletes' own
      ['ana', 'bdt', true, false],
      ['dee', 'bwo', true, false],
    ])
  })

  it('passes a result stored whole, before the stored form existed, through unchanged', () => {
    const full = throughJson(runAudit(inputs))
    expect(unpackAuditResult(full)).toBe(full)
    expect(unpackAuditResult(full)).toStrictEqual(runAudit(inputs))
  })

  it('refuses a stored form it does not know', () => {
    const future = { ...packAuditResult(runAudit(inputs)), format: 3 }
    expect(() => unpackAuditResult(future as unknown as StoredAuditResult)).toThrow(RangeError)
  })

  it.each<[string, (result: AuditResult) => AuditResult]>([
    ['an athlete the result does not list', (r) => ({ ...r, athletes: r.athletes.slice(1) })],
    ['another squad than the athlete’s', (r) => tamper(r, { squadId: 'squad-z' })],
    ['another weight than the options give', (r) => tamper(r, { weight: 1.5 })],
    ['a weighted deficit that is not the product', (r) => tamper(r, { weightedDeficit: 9 })],
    ['another name for an element already listed', (r) => tamper(r, { elementName: 'X' }, 1)],
    ['a missing counterpart that has a name', (r) => tamper(r, { counterpartMissing: true })],
    ['a never-started flag at odds with the step', (r) => tamper(r, { counterpartStepIndex: 0 })],
  ])('refuses to store a gap with %s, which it could not give back', (_name, change) => {
    expect(() => packAuditResult(change(runAudit(inputs)))).toThrow(RangeError)
  })

  it('gives back a generated club as computed, in a fifth of the size at most', () => {
    const rng = xoroshiro128plus(4242)
    const int = (min: number, max: number) => uniformInt(rng, min, max)
    // Ids shaped like the database's, so the sizes compare as they do there.
    const uuid = () =>
      Array.from({ length: 32 }, () => int(0, 15).toString(16))
        .join('')
        .replace(/^(.{8})(.{4})(.{4})(.{4})/, '$1-$2-$3-$4-')
    const rotations = ['none', 'single', 'double', 'triple'] as const
    const twists = ['none', 'half', 'full', 'more'] as const
    const shapes = ['tucked', 'piked', 'stretched'] as const
    const catalogue: AuditElement[] = []
    for (let i = 0; i < 120; i++) {
      const rotationClass = rotations[int(0, 3)]!
      const twistBand = twists[int(0, 3)]!
      const name = (direction: string) =>
        `Salto ${direction} ${shapes[i % 3]}, ${rotationClass} rotation, ${twistBand} twist (${i})`
      const backward = uuid()
      const forward = uuid()
      const kind = int(0, 9)
      // 0: no counterpart at all; 1: a counterpart named but missing from the catalogue
      const counterpartId = kind === 0 ? null : kind === 1 ? uuid() : forward
      catalogue.push({
        id: backward,
        name: name('backward'),
        apparatus: 'floor',
        direction: 'backward',
        rotationClass,
        twistBand,
        counterpartId,
        stepCount: int(3, 8),
      })
      if (counterpartId === forward) {
        catalogue.push({
          id: forward,
          name: name('forward'),
          apparatus: 'floor',
          direction: 'forward',
          rotationClass,
          twistBand,
          counterpartId: backward,
          stepCount: int(3, 8),
        })
      }
      if (i % 15 === 0) {
        catalogue.push({
          id: uuid(),
          name: `Salto sideward ${i}`,
          apparatus: 'floor',
          direction: 'sideward',
          rotationClass,
          twistBand,
          counterpartId: null,
          stepCount: int(3, 6),
        })
      }
    }
    const squads = Array.from({ length: 6 }, uuid)
    const club: AuditAthlete[] = Array.from({ length: 300 }, () => ({
      id: uuid(),
      squadId: squads[int(0, squads.length - 1)]!,
      birthYear: int(2008, 2018),
      discipline: int(0, 3) === 0 ? 'artistic-men' : 'artistic-women',
    }))
    const clubRecords: AuditRecord[] = []
    for (const athlete of club) {
      for (const element of catalogue) {
        if (int(0, 9) >= 4) continue
        clubRecords.push(
          rec(athlete.id, element.id, int(0, 9) === 0 ? null : int(0, element.stepCount - 1)),
        )
      }
    }
    const result = runAudit(
      { asOf, elements: catalogue, athletes: club, records: clubRecords },
      { rotationWeights: { none: 0.4, single: 1.1, double: 2.3, triple: 3.7 } },
    )

    // the club exercises every kind of gap the stored form derives
    const { gaps } = result
    expect(gaps.length).toBeGreaterThan(3000)
    expect(new Set(gaps.map((g) => g.squadId)).size).toBe(squads.length)
    expect(new Set(gaps.map((g) => g.rotationClass)).size).toBe(rotations.length)
    expect(gaps.some((g) => g.counterpartMissing && g.counterpartId === null)).toBe(true)
    expect(gaps.some((g) => g.counterpartMissing && g.counterpartId !== null)).toBe(true)
    expect(gaps.some((g) => g.counterpartNeverStarted)).toBe(true)
    expect(gaps.some((g) => !g.counterpartMissing && !g.counterpartNeverStarted)).toBe(true)

    const packed = expectRoundTrip(result)
    const ratio = JSON.stringify(packed).length / JSON.stringify(result).length
    // about 7 % for this club: each gap keeps five short figures instead of fourteen fields
    expect(ratio).toBeLessThan(0.2)
  })
})
