import { describe, expect, it } from 'vitest'
import { runAudit } from '../../shared/domain/audit/run.ts'
import { displayNames } from '../../shared/domain/element-names.ts'
import { athletes, el, rec } from '../support/audit-example.ts'

// A back tuck is performed on floor and on trampoline alike (FIG Trampoline Code of Points and
// Women's Artistic Code of Points both list it); a club's catalogue may hold one of each.
describe('element names in mixed lists', () => {
  it.each([
    [
      'adds the apparatus to a name used on two apparatus',
      [
        { id: 'a', name: 'Back tuck', apparatus: 'floor' },
        { id: 'b', name: 'back tuck ', apparatus: 'trampoline' },
        { id: 'c', name: 'Front tuck', apparatus: 'floor' },
      ],
      ['Back tuck (floor)', 'back tuck (trampoline)', 'Front tuck'],
    ],
    [
      'keeps a name repeated on one apparatus as it is',
      [
        { id: 'a', name: 'Back tuck', apparatus: 'floor' },
        { id: 'b', name: 'Back tuck', apparatus: 'Floor' },
      ],
      ['Back tuck', 'Back tuck'],
    ],
  ])('%s', (_, elements, names) => {
    const shown = displayNames(elements)
    expect(elements.map((e) => shown.get(e.id))).toEqual(names)
  })

  it('names both back tucks of an audit by their apparatus in its gap list', () => {
    const floor = { ...el('bt', 'backward', 'single', 'none', 'ft', 5), name: 'Back tuck' }
    const tramp = {
      ...el('tbt', 'backward', 'single', 'none', 'tft', 5),
      name: 'Back tuck',
      apparatus: 'trampoline',
    }
    const front = { ...el('ft', 'forward', 'single', 'none', 'bt', 5), name: 'Front tuck' }
    const trampFront = {
      ...el('tft', 'forward', 'single', 'none', 'tbt', 5),
      name: 'Front tuck',
      apparatus: 'trampoline',
    }
    // ana: both back tucks at step index 4, both front tucks never started: two gaps.
    const result = runAudit({
      asOf: '2026-06-30',
      elements: [floor, tramp, front, trampFront],
      athletes: athletes.slice(0, 1),
      records: [rec('ana', 'bt', 4), rec('ana', 'tbt', 4)],
    })
    expect(result.gaps.map((g) => [g.elementName, g.counterpartName]).sort()).toEqual([
      ['Back tuck (floor)', 'Front tuck (floor)'],
      ['Back tuck (trampoline)', 'Front tuck (trampoline)'],
    ])
  })
})
