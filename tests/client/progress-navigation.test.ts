import { describe, expect, it } from 'vitest'
import { pairGaps, type PairElement } from '@/components/progress/progressFormat'
import { progressNavItems, progressRoutes } from '@/router/progressRoutes'

describe('progressNavItems', () => {
  it.each([
    ['director', ['Squads', 'Log progress', 'Missing skills']],
    ['coach', ['Squads', 'Log progress', 'Missing skills']],
    ['clinician', ['Squads', 'Missing skills']],
    ['board', []],
    [null, []],
  ] as const)('gives a %s the entries %j', (role, labels) => {
    expect(progressNavItems(role).map((i) => i.label)).toEqual(labels)
  })

  it('links only to named routes of the feature, each lazy and with its roles', () => {
    const names = progressRoutes.map((r) => r.name)
    for (const item of progressNavItems('director')) {
      expect(names).toContain((item.to as { name: string }).name)
    }
    for (const route of progressRoutes) {
      expect(typeof route.component).toBe('function')
      expect(route.meta?.roles?.length).toBeGreaterThan(0)
    }
    expect(progressRoutes.find((r) => r.name === 'progress-log')?.meta?.roles).toEqual([
      'director',
      'coach',
    ])
  })
})

const element = (
  elementId: string,
  name: string,
  direction: PairElement['direction'],
  counterpartId: string | null,
  stepCount = 6,
): PairElement => ({ elementId, name, direction, counterpartId, stepCount })

describe('pairGaps', () => {
  const elements = [
    element('bt', 'Back tuck', 'backward', 'ft'),
    element('ft', 'Front tuck', 'forward', 'bt'),
    element('bp', 'Back pike', 'backward', 'fp'),
    element('fp', 'Front pike', 'forward', 'bp'),
    element('bl', 'Back layout', 'backward', null),
    element('bd', 'Double back tuck', 'backward', 'fd'),
    element('fd', 'Double front tuck', 'forward', 'bd'),
  ]

  it('says by how much the forward element trails, or why there is nothing to compare', () => {
    const gaps = pairGaps(
      [
        { elementId: 'bt', stepIndex: 4 },
        { elementId: 'ft', stepIndex: 1 },
        { elementId: 'bp', stepIndex: 2 },
        { elementId: 'bl', stepIndex: 0 },
        { elementId: 'fd', stepIndex: 0 },
      ],
      elements,
    )
    expect(gaps.map((g) => [g.backward.name, g.text, g.lagging])).toEqual([
      ['Back tuck', 'forward trails by 3 steps', true],
      ['Back pike', 'forward not started', true],
      ['Back layout', 'no forward element in the catalogue', true],
      ['Double back tuck', 'backward not started', false],
    ])
  })
})
