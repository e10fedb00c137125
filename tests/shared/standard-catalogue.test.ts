import { describe, expect, it } from 'vitest'
import {
  catalogueGaps,
  descriptionKey,
  rotationClass,
  totalHalfTwists,
  twistBand,
} from '../../shared/domain/catalogue.ts'
import { rotationClasses, standardApparatus, twistBands } from '../../shared/domain/element.ts'
import { standardCatalogue } from '../../shared/domain/standard-catalogue.ts'
import { elementInputSchema } from '../../shared/schemas/elements.ts'

const withIds = standardCatalogue.map((element, index) => ({ ...element, id: `e${index}` }))

describe('standard catalogue', () => {
  it('holds at least 80 elements', () => {
    expect(standardCatalogue.length).toBeGreaterThanOrEqual(80)
  })

  it('passes the element input schema, element by element', () => {
    const refused = standardCatalogue
      .map((element) => ({ element, result: elementInputSchema.safeParse(element) }))
      .filter(({ result }) => !result.success)
      .map(
        ({ element, result }) => `${element.apparatus}/${element.name}: ${result.error?.message}`,
      )
    expect(refused).toEqual([])
  })

  it.each(standardApparatus)('covers %s with unique names', (apparatus) => {
    const names = standardCatalogue.filter((e) => e.apparatus === apparatus).map((e) => e.name)
    expect(names.length).toBeGreaterThanOrEqual(20)
    expect(new Set(names.map((name) => name.toLowerCase())).size).toBe(names.length)
  })

  it('never describes one skill twice', () => {
    const keys = standardCatalogue.map(descriptionKey)
    const repeated = keys.filter((key, index) => keys.indexOf(key) !== index)
    expect(repeated).toEqual([])
  })

  it('is balanced: every forward and backward element has its mirror', () => {
    const gaps = catalogueGaps(withIds)
    expect(gaps.backwardWithoutForward.map((e) => e.name)).toEqual([])
    expect(gaps.forwardWithoutBackward.map((e) => e.name)).toEqual([])
  })

  it('keeps sideward elements few', () => {
    const sideward = standardCatalogue.filter((e) => e.direction === 'sideward')
    expect(sideward.length).toBeGreaterThan(0)
    expect(sideward.length).toBeLessThanOrEqual(standardCatalogue.length / 10)
  })

  it.each(
    rotationClasses.flatMap((rotation) => [
      ['forward', rotation],
      ['backward', rotation],
    ]),
  )('has %s elements of rotation class %s', (direction, rotation) => {
    const found = standardCatalogue.filter(
      (e) => e.direction === direction && rotationClass(e.quarterRotations) === rotation,
    )
    expect(found.length).toBeGreaterThan(0)
  })

  it.each(
    twistBands.flatMap((band) => [
      ['forward', band],
      ['backward', band],
    ]),
  )('has %s elements of twist band %s', (direction, band) => {
    const found = standardCatalogue.filter(
      (e) => e.direction === direction && twistBand(totalHalfTwists(e.twists)) === band,
    )
    expect(found.length).toBeGreaterThan(0)
  })

  it('has triples only on the trampoline', () => {
    const triples = standardCatalogue.filter((e) => rotationClass(e.quarterRotations) === 'triple')
    expect(triples.length).toBeGreaterThanOrEqual(4)
    expect(new Set(triples.map((e) => e.apparatus))).toEqual(new Set(['trampoline']))
  })

  it.each([
    // twisting doubles named in the product brief, by twist placement
    ['half-in', [1, 0]],
    ['half-out', [0, 1]],
    ['full-in', [2, 0]],
    ['full-out', [0, 2]],
  ])('has the %s double in both directions on floor, tumbling and trampoline', (_name, twists) => {
    for (const apparatus of standardApparatus) {
      for (const direction of ['forward', 'backward']) {
        const found = standardCatalogue.filter(
          (e) =>
            e.apparatus === apparatus &&
            e.direction === direction &&
            e.quarterRotations === 8 &&
            e.twists.join() === twists.join(),
        )
        expect(found.length, `${apparatus} ${direction}`).toBeGreaterThan(0)
      }
    }
  })

  it.each([
    // from memory: FIG women's artistic Code of Points letter values
    ['Back tuck', 'A'],
    ['Double back tuck', 'D'],
    ['Full-in back tuck', 'E'],
  ])('gives the floor %s the letter %s', (name, letter) => {
    const found = standardCatalogue.find((e) => e.apparatus === 'floor' && e.name === name)
    expect(found?.difficultyLetter).toBe(letter)
  })

  it('gives difficulty letters on the floor only', () => {
    const lettered = standardCatalogue.filter((e) => e.difficultyLetter != null)
    expect(lettered.length).toBeGreaterThan(0)
    expect(lettered.every((e) => e.apparatus === 'floor')).toBe(true)
  })
})
