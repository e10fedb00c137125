import { mount } from '@vue/test-utils'
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest'
import { layoutGridColumns, startedColumns } from '@shared/domain/grid-layout'
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

const layoutOf = (g: Grid, hideUnstarted = false) =>
  layoutGridColumns(
    g.columns.map((c) => ({ ...c, twistBand: 'none' as const })),
    startedColumns(g.cells, g.columns.length),
    { hideUnstarted },
  )

async function mountGrid(g: Grid = grid, extra: Record<string, unknown> = {}) {
  const router = progressRouter()
  const wrapper = mount(ProgressSquadGrid, {
    props: { grid: g, layout: layoutOf(g), ...extra },
    global: { plugins: [router] },
  })
  await router.isReady()
  return wrapper
}

// happy-dom lays nothing out: the scrolling box is given a tablet's size, so that the grid
// draws the rows and columns that would be on screen.
const sizes = { clientWidth: 800, clientHeight: 600 }
const saved = new Map<string, PropertyDescriptor | undefined>()
beforeAll(() => {
  for (const [key, value] of Object.entries(sizes)) {
    saved.set(key, Object.getOwnPropertyDescriptor(HTMLElement.prototype, key))
    Object.defineProperty(HTMLElement.prototype, key, { configurable: true, get: () => value })
  }
})
afterAll(() => {
  for (const [key, descriptor] of saved)
    if (descriptor) Object.defineProperty(HTMLElement.prototype, key, descriptor)
    else delete (HTMLElement.prototype as unknown as Record<string, unknown>)[key]
})

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
    const rows = wrapper.findAll('[data-test="grid-row"]')
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
    const rows = wrapper.findAll('[data-test="grid-row"]')
    // Mia: back tuck at step 5, front tuck at step 2: three steps behind.
    const trailing = rows[0]!.findAll('[data-test="grid-cell"]')[1]!
    expect(trailing.classes()).toContain('trailing')
    expect(trailing.find('[data-test="trail-mark"]').text()).toBe('↓3')
    expect(trailing.find('[data-cell]').attributes('title')).toContain(
      'forward trails the backward element by 3 steps',
    )
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

  it('makes each cell a button named for the athlete, the element and the step, when the viewer may write', async () => {
    const wrapper = await mountGrid(grid, { canWrite: true })
    const buttons = wrapper.findAll('button[data-cell]')
    expect(buttons).toHaveLength(6)
    expect(buttons[0]!.attributes('aria-label')).toBe('Mia Novak: Back tuck step 5 of 6')
    expect(buttons[2]!.attributes('aria-label')).toBe('Mia Novak: Back pike not started')
    await buttons[4]!.trigger('click')
    // Lena (row 1), front tuck (column 1).
    expect(wrapper.emitted('open')).toEqual([[1, 1]])
  })

  it('draws no buttons for a read-only viewer', async () => {
    const wrapper = await mountGrid(grid, { canWrite: false })
    expect(wrapper.findAll('button[data-cell]')).toHaveLength(0)
    expect(wrapper.findAll('[data-test="grid-cell"]')).toHaveLength(6)
  })

  it('draws only the rows and columns on screen of a 40 × 150 grid, and counts them all for assistive technology', async () => {
    const many: Grid = {
      squad: grid.squad,
      athletes: Array.from({ length: 40 }, (_, i) => ({
        id: id(1000 + i),
        givenName: `A${i}`,
        familyName: `F${i}`,
      })),
      columns: Array.from({ length: 150 }, (_, j) => ({
        ...grid.columns[2]!,
        elementId: id(5000 + j),
        name: `E${j}`,
        pairKey: id(5000 + j),
      })),
      cells: Array.from({ length: 40 }, () =>
        Array.from({ length: 150 }, () => ({ step: 1, paused: false, flagged: false })),
      ),
    }
    const wrapper = await mountGrid(many)
    const rows = wrapper.findAll('[data-test="grid-row"]')
    // 600 px of height hold about 8 rows of 48 px below the headers, 800 px about 7 columns of
    // 96 px beside the names: with the overscan a few more, far from 40 × 150.
    expect(rows.length).toBeGreaterThan(3)
    expect(rows.length).toBeLessThan(20)
    const cells = rows[0]!.findAll('[data-test="grid-cell"]')
    expect(cells.length).toBeGreaterThan(3)
    expect(cells.length).toBeLessThan(15)
    const table = wrapper.find('table')
    expect(table.attributes('aria-rowcount')).toBe('43')
    expect(table.attributes('aria-colcount')).toBe('151')
  })

  it('heads each family of pairs', async () => {
    const wrapper = await mountGrid()
    const families = wrapper.findAll('[data-test="grid-family"]')
    expect(families.map((f) => f.text())).toEqual(['Single · No twist · trampoline'])
    expect(families[0]!.attributes('colspan')).toBe('3')
  })
})
