// Edges of the audit's formulas and of the canonical text its input hash is taken over, which
// the worked example does not reach. Formulas from the product brief; JSON text as RFC 8259
// writes it, with keys and array items in UTF-16 code unit order (see canonicalJson).
import { describe, expect, it } from 'vitest'
import {
  compareText,
  findCatalogueGaps,
  forecastDate,
  proficiency,
} from '../../shared/domain/audit/formulas.ts'
import { canonicalJson } from '../../shared/domain/audit/hashing.ts'
import { el } from '../support/audit-example.ts'

describe('formula edges', () => {
  it.each<[number, number]>([
    [-1, 5],
    [-2, 5], // (−2 + 1) / 5 would be negative: a step below the first is no proficiency
  ])('proficiency of step index %i of %i steps is 0', (stepIndex, stepCount) => {
    expect(proficiency(stepIndex, stepCount)).toBe(0)
  })

  it('forecasts no more steps as the as-of date itself, whatever the pace', () => {
    // nothing left to climb: done now, even for an athlete with no pace
    expect(forecastDate('2025-09-15', 0, 0)).toBe('2025-09-15')
    expect(forecastDate('2025-09-15', 0, 2)).toBe('2025-09-15')
    expect(forecastDate('2025-09-15', 1, Number.POSITIVE_INFINITY)).toBeNull()
  })

  it('lists catalogue gaps by element id whatever the catalogue order', () => {
    const unsorted = [
      el('bwo', 'backward', 'none', 'none', null, 3),
      el('ft', 'forward', 'single', 'none', null, 5),
      el('bdt', 'backward', 'double', 'none', 'fdt', 8),
      el('bt', 'backward', 'single', 'none', 'ft', 5),
    ]
    expect(findCatalogueGaps(unsorted).map((g) => g.elementId)).toEqual(['bdt', 'bwo'])
  })

  it.each([
    ['a', 'b', -1],
    ['b', 'a', 1],
    ['a', 'a', 0],
    ['B', 'a', -1], // code unit order: upper case before lower case
    ['10', '9', -1],
  ])('compares %s with %s as %i', (a, b, expected) => {
    expect(compareText(a, b)).toBe(expected)
  })
})

describe('canonical JSON edges', () => {
  it('writes an undefined array item as null, as JSON does', () => {
    // items sorted by their text: "1" before "null"
    expect(canonicalJson([undefined, 1])).toBe('[1,null]')
    expect(canonicalJson(undefined)).toBe('null')
    expect(canonicalJson(null)).toBe('null')
  })

  it('leaves out an undefined property of an object that holds an object', () => {
    expect(canonicalJson({ b: undefined, a: [2, 1], c: { y: 1, x: null } })).toBe(
      '{"a":[1,2],"c":{"x":null,"y":1}}',
    )
  })

  it('writes strings, numbers and booleans as JSON does', () => {
    expect(canonicalJson('a "quoted" text, longer than ten')).toBe(
      '"a \\"quoted\\" text, longer than ten"',
    )
    expect(canonicalJson(['b', 2, true, 'a'])).toBe('["a","b",2,true]')
  })
})
