import { flushPromises, mount } from '@vue/test-utils'
import { createPinia, setActivePinia } from 'pinia'
import { afterEach, describe, expect, it, vi } from 'vitest'
import { defineComponent, type VNodeChild } from 'vue'
import type { MissingSkill } from '@shared/schemas/progress'
import * as progressApi from '@/api/progress'
import * as squadsApi from '@/api/squads'
import { missingSkillColumns } from '@/components/progress/missingSkillColumns'
import MissingSkillsView from '@/views/MissingSkillsView.vue'
import { signInAs } from './audit-helpers'
import { mountWithProviders } from './mount'
import { progressRouter } from './progress-helpers'

vi.mock('@/api/progress', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/progress')>()),
  listMissingSkills: vi.fn(),
}))
vi.mock('@/api/squads', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/squads')>()),
  listSquads: vi.fn(),
}))

afterEach(() => {
  document.body.innerHTML = ''
})

const id = (n: number) => `00000000-0000-4000-8000-${String(n).padStart(12, '0')}`

/** The text a column draws for one row. */
function cellText(key: string, row: MissingSkill) {
  const column = missingSkillColumns().find((c) => 'key' in c && c.key === key)
  if (column === undefined || !('render' in column) || !column.render) throw new Error(key)
  const render = column.render as (m: MissingSkill, index: number) => VNodeChild
  return mount(defineComponent({ render: () => render(row, 0) })).text()
}

// A back tuck at step 6 of its 9 steps, the front tuck at step 2 of 9 (worked by hand: indices
// 5 and 1, counted from 1 as coaches count them).
const skill: MissingSkill = {
  athleteId: id(1),
  athleteName: 'Mia Novak',
  squadId: id(2),
  squadName: 'Juniors',
  backward: { elementId: id(3), name: 'Back tuck', stepIndex: 5, stepCount: 9 },
  forward: { elementId: id(4), name: 'Front tuck', stepIndex: 1, stepCount: 9 },
  trailBy: 4,
}

describe('the missing-skills list', () => {
  it('reads each step out of its progression: "step 6 of 9"', () => {
    expect(cellText('backward', skill)).toBe('Back tuck · step 6 of 9')
    expect(cellText('forward', skill)).toBe('Front tuck · step 2 of 9')
  })
})

describe('MissingSkillsView', () => {
  it('leaves out elements with no forward element in the catalogue unless asked for', async () => {
    // The back walkover has no forward element in the catalogue: the director's to add. It came
    // first in the old order (no forward sorted above any trail).
    const walkover: MissingSkill = {
      ...skill,
      backward: { elementId: id(5), name: 'Back walkover', stepIndex: 2, stepCount: 4 },
      forward: null,
      trailBy: null,
    }
    vi.mocked(progressApi.listMissingSkills).mockResolvedValue([skill, walkover])
    vi.mocked(squadsApi.listSquads).mockResolvedValue([])
    const pinia = createPinia()
    setActivePinia(pinia)
    signInAs('coach')
    mountWithProviders(MissingSkillsView, {}, { router: progressRouter(), pinia })
    await flushPromises()
    const rows = () => [...document.querySelectorAll('tbody tr')].map((r) => r.textContent)
    await vi.waitFor(() => expect(rows()).toHaveLength(1))
    expect(rows()[0]).toContain('Back tuck')
    expect(document.body.textContent).toContain('1 gap · 1 athlete')

    document
      .querySelector<HTMLElement>('[data-test="missing-catalogue-filter"] .n-checkbox-box')!
      .click()
    await flushPromises()
    expect(rows()).toHaveLength(2)
    expect(rows()[1]).toContain('Back walkover')
    expect(rows()[1]).toContain('not in the catalogue')
  })
})
