import { describe, expect, it } from 'vitest'
import { deriveElement } from '../../shared/domain/catalogue.ts'
import {
  requirementCandidates,
  womensArtisticFloorProfile,
} from '../../shared/domain/audit/readiness.ts'
import { runAudit } from '../../shared/domain/audit/run.ts'
import type { AuditElement, RequirementStatus } from '../../shared/domain/audit/types.ts'
import type { ElementInput } from '../../shared/schemas/elements.ts'
import { standardCatalogue } from '../../shared/domain/standard-catalogue.ts'

/** A catalogue element as the audit reads it, id `apparatus:name`, rotation and twist derived. */
function auditElement(e: ElementInput, stepCount = 5): AuditElement {
  const derived = deriveElement(e)
  return {
    id: `${e.apparatus}:${e.name}`,
    name: e.name,
    apparatus: e.apparatus,
    direction: e.direction,
    rotationClass: derived.rotationClass,
    twistBand: derived.twistBand,
    counterpartId: null,
    stepCount,
  }
}

// A 1¼ back salto (5 quarter saltos) on floor, which no standard catalogue holds.
const backOneAndQuarter: ElementInput = {
  name: 'Back 1¼ salto',
  apparatus: 'floor',
  direction: 'backward',
  quarterRotations: 5,
  twists: [0, 0],
  shape: 'tuck',
  takeOff: 'round-off',
}
// Derived inside each test rather than while the file is collected (see audit.test.ts).
const catalogueOf = () => [...standardCatalogue, backOneAndQuarter].map((e) => auditElement(e))

const requirement = (id: string) =>
  womensArtisticFloorProfile.requirements.find((r) => r.id === id)!
const candidateIds = (id: string) => {
  const catalogue = catalogueOf()
  return new Set(
    requirementCandidates(womensArtisticFloorProfile, requirement(id), catalogue).map(
      (i) => catalogue[i]!.id,
    ),
  )
}

// The published source: FIG Women's Artistic Gymnastics Code of Points 2022–2024, Floor
// Exercise, Composition Requirements (the article number from memory). Besides a dance passage,
// which is not an acrobatic element, they ask for: a salto with a longitudinal turn of at least
// 360°, a double salto, a salto forward or sideward, and a salto backward.
describe('the seeded women’s floor profile against the published composition requirements', () => {
  it('is met on floor and holds the four acrobatic requirements', () => {
    expect(womensArtisticFloorProfile.apparatus).toBe('floor')
    expect(womensArtisticFloorProfile.discipline).toBe('artistic-women')
    expect(womensArtisticFloorProfile.requirements.map((r) => r.id)).toEqual([
      'salto-full-twist',
      'double-salto',
      'salto-forward-sideward',
      'salto-backward',
    ])
  })

  it.each([
    // "salto with longitudinal turn (min. 360°)": a full twist is 360°, a half twist 180°
    ['salto-full-twist', 'Back full', 'Barani'],
    ['salto-full-twist', 'Front double twist', 'Back layout half twist'],
    ['salto-full-twist', 'Full-in back tuck', 'Double back tuck'],
    // "double salto": two full rotations; a 1¼ salto completes one
    ['double-salto', 'Double back tuck', 'Back tuck'],
    ['double-salto', 'Double front pike', 'Back 1¼ salto'],
    // "salto forward or sideward": forward and sideward saltos count alike; a handspring is no salto
    ['salto-forward-sideward', 'Front tuck', 'Front handspring'],
    ['salto-forward-sideward', 'Side somersault', 'Back tuck'],
    ['salto-forward-sideward', 'Aerial cartwheel', 'Cartwheel'],
    // "salto backward"
    ['salto-backward', 'Back tuck', 'Back handspring'],
    ['salto-backward', 'Back 1¼ salto', 'Front tuck'],
  ])('%s is met by the floor %s, not by the floor %s', (id, meets, doesNot) => {
    const ids = candidateIds(id)
    expect(ids.has(`floor:${meets}`)).toBe(true)
    // the element left out is in the catalogue, so its absence from the candidates means something
    expect(catalogueOf().some((e) => e.id === `floor:${doesNot}`)).toBe(true)
    expect(ids.has(`floor:${doesNot}`)).toBe(false)
  })

  it.each(womensArtisticFloorProfile.requirements.map((r) => [r.id]))(
    '%s is never met by an element of another apparatus',
    (id) => {
      const ids = [...candidateIds(id)]
      expect(ids.length).toBeGreaterThan(0)
      expect(ids.filter((e) => !e.startsWith('floor:'))).toEqual([])
    },
  )
})

describe('the element suggested for a requirement not yet met', () => {
  // Hand-worked: a floor catalogue where the doubles have short progressions (3 steps) and the
  // single saltos long ones. Counting steps alone sends a beginner to the doubles.
  const el = (
    id: string,
    direction: AuditElement['direction'],
    rotationClass: AuditElement['rotationClass'],
    twistBand: AuditElement['twistBand'],
    stepCount: number,
    apparatus = 'floor',
  ): AuditElement => ({
    id,
    name: id,
    apparatus,
    direction,
    rotationClass,
    twistBand,
    counterpartId: null,
    stepCount,
  })
  const elements = [
    el('bf', 'backward', 'single', 'full', 8), // back full
    el('bp', 'backward', 'single', 'none', 3), // back pike
    el('bt', 'backward', 'single', 'none', 6), // back tuck
    el('dbt', 'backward', 'double', 'none', 3), // double back tuck
    el('fif', 'backward', 'double', 'full', 3), // full-in double back
    el('ft', 'forward', 'single', 'none', 5), // front tuck
    el('t-fif', 'backward', 'double', 'full', 2, 'trampoline'), // trampoline full-in
  ]
  // Born 2010: 16 in 2026, senior from 1 January 2026 (FIG WAG seniors from 16, from memory).
  const readiness = (records: [string, number][]): Record<string, RequirementStatus> => {
    const result = runAudit({
      asOf: '2025-09-15',
      elements,
      athletes: [{ id: 'a', squadId: 's', birthYear: 2010, discipline: 'artistic-women' }],
      records: records.map(([elementId, stepIndex]) => ({ athleteId: 'a', elementId, stepIndex })),
      paces: { a: 3 },
    })
    return Object.fromEntries(result.readiness[0]!.requirements.map((r) => [r.requirementId, r]))
  }

  it('prefers the lowest rotation class and twist band, then the fewest steps', () => {
    // A beginner at step index 1 of the back tuck (6 steps) and on the trampoline full-in.
    const r = readiness([
      ['bt', 1],
      ['t-fif', 1],
    ])
    // full twist: bf (single, full; 8 steps, not started: 8 to go) before fif (double, full; 3)
    expect([r['salto-full-twist']!.elementId, r['salto-full-twist']!.stepsNeeded]).toEqual([
      'bf',
      8,
    ])
    // double: dbt (no twist) before fif (full twist), both 3 to go; never the trampoline one
    expect([r['double-salto']!.elementId, r['double-salto']!.stepsNeeded]).toEqual(['dbt', 3])
    // backward: the single, untwisted bp (3 to go) and bt (5 − 1 = 4 to go): bp, fewer steps;
    // not dbt (double, 3 to go), which counting steps alone would tie with bp and pick by id
    expect([r['salto-backward']!.elementId, r['salto-backward']!.stepsNeeded]).toEqual(['bp', 3])
    // forward: only ft, 5 to go; 5 / 3 × 30 = 50 days after 2025-09-15
    expect(r['salto-forward-sideward']).toMatchObject({
      elementId: 'ft',
      stepsNeeded: 5,
      forecastOn: '2025-11-04',
    })
  })

  it('names the element that meets a requirement, whatever its level', () => {
    // competition-ready on the full-in (last step index 2 of 3): full twist, double and backward
    // are all met by it, though simpler elements would have been suggested otherwise
    const r = readiness([['fif', 2]])
    for (const id of ['salto-full-twist', 'double-salto', 'salto-backward']) {
      expect(r[id]).toMatchObject({ met: true, elementId: 'fif', stepsNeeded: 0 })
    }
  })

  it('never counts an element of another apparatus as met', () => {
    // competition-ready on the trampoline full-in (step index 1 of 2): still nothing met on floor
    const r = readiness([['t-fif', 1]])
    expect(Object.values(r).map((s) => s.met)).toEqual([false, false, false, false])
  })
})
