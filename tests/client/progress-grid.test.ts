import { mount } from '@vue/test-utils'
import { afterEach, describe, expect, it } from 'vitest'
import type { Grid } from '@shared/schemas/progress'
import ProgressSquadGrid from '@/components/progress/ProgressSquadGrid.vue'
import { progressRouter } from './progress-helpers'

const id = (n: number) => `00000000-0000-4000-8000-${String(n).padStart(12, '0')}`

// Back tuck and front tuck share the FIG trampoline notation 40o (FIG Trampoline Code of Points
// 2005, as in tests/shared/catalogue.test.ts); the back pike has no forward mirror here.
const grid: Grid = {
  squad: { id: id(1), name: 'Junior tumbling' },
  athletes: [
    { id: id(11), givenName: 'Mia', familyName: 'Novak' },
    { id: id(12), givenName: 'Lena', familyName: 'Ortiz' },
  ],
  columns: [
    {
      elementId: id(21),
      name: 'Back tuck',
      apparatus: 'trampoline',
      direction: 'backward',
      rotationClass: 'single',
      notation: '40o',
      stepCount: 6,
      counterpartId: id(22),
      pairKey: id(21),
    },
    {
      elementId: id(22),
      name: 'Front tuck',
      apparatus: 'trampoline',
      direction: 'forward',
      rotationClass: 'single',
      notation: '40o',
      stepCount: 6,
      counterpartId: id(21),
      pairKey: id(21),
    },
    {
      elementId: id(23),
      name: 'Back pike',
      apparatus: 'trampoline',
      direction: 'backward',
      rotationClass: 'single',
      notation: '40<',
      stepCount: 6,
      counterpartId: null,
      pairKey: id(23),
    },
  ],
  cells: [
    [
      { step: 4, paused: false, flagged: false },
      { step: 1, paused: true, flagged: false },
      { step: null, paused: false, flagged: false },
    ],
    [
      { step: 2, paused: false, flagged: true },
      { step: 1, paused: false, flagged: false },
      { step: 0, paused: false, flagged: false },
    ],
  ],
}

async function mountGrid() {
  const router = progressRouter()
  const wrapper = mount(ProgressSquadGrid, { props: { grid }, global: { plugins: [router] } })
  await router.isReady()
  return wrapper
}

afterEach(() => {
  document.body.innerHTML = ''
})

describe('ProgressSquadGrid', () => {
  it('puts a backward element and its forward mirror side by side under one header', async () => {
    const wrapper = await mountGrid()
    const groups = wrapper.findAll('[data-test="grid-group"]')
    expect(groups.map((g) => g.text())).toEqual(['Back tuck / Front tuck', 'Back pike'])
    expect(groups[0]!.attributes('colspan')).toBe('2')
    expect(groups[0]!.attributes('scope')).toBe('colgroup')
    const columns = wrapper.findAll('[data-test="grid-column"]').map((c) => c.text())
    expect(columns[0]).toContain('Backward')
    expect(columns[1]).toContain('Forward')
    expect(columns[2]).toContain('no forward')
  })

  it('shows each step as reached/steps, a dash when not started and a text mark when paused or flagged', async () => {
    const wrapper = await mountGrid()
    const rows = wrapper.findAll('tbody tr')
    const first = rows[0]!.findAll('[data-test="grid-cell"]')
    expect(first[0]!.text()).toBe('5/6')
    expect(first[1]!.text()).toContain('2/6')
    expect(first[1]!.find('[aria-label="paused"]').text()).toBe('‖')
    expect(first[2]!.text()).toBe('–')
    const second = rows[1]!.findAll('[data-test="grid-cell"]')
    expect(second[0]!.find('[aria-label="flagged by a check"]').text()).toBe('!')
  })

  it('marks a forward cell trailing its backward mirror by 2 steps or more with text, not colour only', async () => {
    const wrapper = await mountGrid()
    const rows = wrapper.findAll('tbody tr')
    // Mia: back tuck at step 5, front tuck at step 2: three steps behind.
    const trailing = rows[0]!.findAll('[data-test="grid-cell"]')[1]!
    expect(trailing.classes()).toContain('trailing')
    expect(trailing.find('[data-test="trail-mark"]').text()).toBe('↓3')
    expect(trailing.attributes('title')).toContain('forward trails the backward element by 3 steps')
    // Lena: one step behind is below the threshold.
    const close = rows[1]!.findAll('[data-test="grid-cell"]')[1]!
    expect(close.classes()).not.toContain('trailing')
    expect(close.find('[data-test="trail-mark"]').exists()).toBe(false)
  })

  it('names each athlete in a row header linking to their page', async () => {
    const wrapper = await mountGrid()
    const header = wrapper.find('tbody th[scope="row"] a')
    expect(header.text()).toBe('Novak, Mia')
    expect(header.attributes('href')).toBe(`/athletes/${id(11)}`)
  })
})
