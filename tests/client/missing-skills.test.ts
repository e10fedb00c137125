import { mount } from '@vue/test-utils'
import { describe, expect, it } from 'vitest'
import { defineComponent, type VNodeChild } from 'vue'
import type { MissingSkill } from '@shared/schemas/progress'
import { missingSkillColumns } from '@/components/progress/missingSkillColumns'

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
