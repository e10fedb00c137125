import { describe, expect, it } from 'vitest'
import {
  clipSpans,
  layoutGridColumns,
  startedColumns,
  type LayoutColumn,
} from '../../shared/domain/grid-layout.ts'

// The elements and their families are the trade's own (from memory): a back tuck and a front tuck
// are single saltos without twist; a back full and a front full are single saltos with one full
// twist (two half turns); a back half and a barani are single saltos with a half twist; a double
// back tuck is a double salto; a round-off has no salto. Columns come as the server sends them:
// by apparatus, then rotations, then name, each backward element followed by its forward mirror.
const col = (
  name: string,
  rotationClass: string,
  twistBand: LayoutColumn['twistBand'],
  pairKey: string,
  apparatus = 'trampoline',
): LayoutColumn => ({ elementId: name, name, apparatus, rotationClass, twistBand, pairKey })

const columns: LayoutColumn[] = [
  col('Round-off', 'none', 'none', 'ro', 'floor'), // 0
  col('Back full', 'single', 'full', 'bfull'), // 1
  col('Front full', 'single', 'full', 'bfull'), // 2
  col('Back half', 'single', 'half', 'bhalf'), // 3
  col('Barani', 'single', 'half', 'bhalf'), // 4
  col('Back tuck', 'single', 'none', 'btuck'), // 5
  col('Front tuck', 'single', 'none', 'btuck'), // 6
  col('Double back tuck', 'double', 'none', 'dbt'), // 7
  col('Back tuck', 'single', 'none', 'ftuck', 'floor'), // 8
]

describe('layoutGridColumns', () => {
  it('orders by rotation class, then twist band, then apparatus, pairs kept whole (worked by hand)', () => {
    const all = columns.map(() => true)
    const layout = layoutGridColumns(columns, all, { hideUnstarted: false })
    // none → single (no twist: floor then trampoline; half; full) → double.
    expect(layout.order).toEqual([0, 8, 5, 6, 3, 4, 1, 2, 7])
    expect(layout.families.map((f) => [f.label, f.start, f.span])).toEqual([
      ['No salto · No twist · floor', 0, 1],
      ['Single · No twist · floor', 1, 1],
      ['Single · No twist · trampoline', 2, 2],
      ['Single · Half twist · trampoline', 4, 2],
      ['Single · Full twist · trampoline', 6, 2],
      ['Double · No twist · trampoline', 8, 1],
    ])
    expect(layout.pairs.map((p) => [p.label, p.start, p.span])).toEqual([
      ['Round-off', 0, 1],
      ['Back tuck', 1, 1],
      ['Back tuck / Front tuck', 2, 2],
      ['Back half / Barani', 4, 2],
      ['Back full / Front full', 6, 2],
      ['Double back tuck', 8, 1],
    ])
    expect(layout.hiddenPairs).toBe(0)
  })

  it('hides a pair only when none of its columns is started', () => {
    // Only the front tuck (the forward half of a pair) and the double back tuck are started.
    const started = columns.map((_, i) => i === 6 || i === 7)
    const layout = layoutGridColumns(columns, started, { hideUnstarted: true })
    expect(layout.order).toEqual([5, 6, 7])
    expect(layout.families.map((f) => f.label)).toEqual([
      'Single · No twist · trampoline',
      'Double · No twist · trampoline',
    ])
    expect(layout.hiddenPairs).toBe(4)
  })

  it('keeps pairs of one family in the order given', () => {
    const same: LayoutColumn[] = [
      col('Back tuck', 'single', 'none', 'a'),
      col('Back pike', 'single', 'none', 'b'),
      col('Front pike', 'single', 'none', 'b'),
      col('Back straight', 'single', 'none', 'c'),
    ]
    const layout = layoutGridColumns(same, [true, true, true, true], { hideUnstarted: false })
    expect(layout.order).toEqual([0, 1, 2, 3])
    expect(layout.families).toHaveLength(1)
    expect(layout.families[0]!.span).toBe(4)
  })

  it('answers an empty layout for no columns', () => {
    expect(layoutGridColumns([], [], { hideUnstarted: true })).toEqual({
      order: [],
      families: [],
      pairs: [],
      hiddenPairs: 0,
    })
  })
})

describe('startedColumns', () => {
  it('counts a step reached or a pause as started, and a blank record as not', () => {
    const cells = [
      [
        { step: null, paused: false },
        { step: 0, paused: false },
        { step: null, paused: false },
      ],
      [
        { step: null, paused: false },
        { step: null, paused: false },
        { step: null, paused: true },
      ],
    ]
    expect(startedColumns(cells, 3)).toEqual([false, true, true])
  })
})

describe('clipSpans', () => {
  it('cuts the spans to the rendered positions', () => {
    const spans = [
      { key: 'a', label: 'A', start: 0, span: 3 },
      { key: 'b', label: 'B', start: 3, span: 2 },
      { key: 'c', label: 'C', start: 5, span: 4 },
    ]
    // Positions 2 to 6 rendered: one column of A, all of B, two of C.
    expect(clipSpans(spans, 2, 7).map((s) => [s.key, s.start, s.span])).toEqual([
      ['a', 2, 1],
      ['b', 3, 2],
      ['c', 5, 2],
    ])
  })
})
