import { flushPromises, type VueWrapper } from '@vue/test-utils'
import { NRadioGroup, NSelect } from 'naive-ui'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { safetyCaution } from '@shared/domain/element'
import { ApiError } from '@/api/http'
import * as api from '@/api/progress'
import ProgressLogPanel from '@/components/progress/ProgressLogPanel.vue'
import {
  athleteId,
  clubId,
  elementId,
  eventIds,
  mountInProviders,
  recordDetail,
  wait,
} from './progress-helpers'

vi.mock('@/api/progress', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/progress')>()),
  getRecordDetail: vi.fn(),
  checkEvent: vi.fn(),
  recordEvent: vi.fn(),
}))

const props = {
  clubId,
  athleteId,
  elementId,
  athleteName: 'Mia Novak',
  elementName: 'Back tuck',
  checkDelayMs: 0,
}

const byTest = (name: string) => document.querySelector<HTMLElement>(`[data-test="${name}"]`)
const saveButton = () => byTest('log-save') as HTMLButtonElement

/** Naive UI's select opens a menu; emitting its update is what choosing an option does. */
function choose(wrapper: VueWrapper, test: string, value: unknown) {
  const select = wrapper.findAllComponents(NSelect).find((s) => s.attributes('data-test') === test)
  if (!select) throw new Error(`no select ${test}`)
  select.vm.$emit('update:value', value)
}

function pick(wrapper: VueWrapper, name: string, value: string) {
  const group = wrapper.findAllComponents(NRadioGroup).find((g) => g.props('name') === name)
  if (!group) throw new Error(`no radio group ${name}`)
  group.vm.$emit('update:value', value)
}

async function settle() {
  await flushPromises()
  await wait(5)
  await flushPromises()
}

beforeEach(() => {
  vi.mocked(api.getRecordDetail).mockReset()
  vi.mocked(api.checkEvent).mockReset()
  vi.mocked(api.recordEvent).mockReset()
  vi.mocked(api.checkEvent).mockResolvedValue({ checks: [], plannedStepIndex: null })
})
afterEach(() => {
  document.body.innerHTML = ''
})

describe('ProgressLogPanel', () => {
  it('asks for a reason when the chosen step skips steps, and blocks saving until one is typed', async () => {
    vi.mocked(api.getRecordDetail).mockResolvedValue(recordDetail({ stepIndex: 0 }))
    const { wrapper } = mountInProviders(ProgressLogPanel, props)
    await settle()
    // The next step is proposed, which skips nothing.
    expect(byTest('skip-reason')).toBeNull()
    // The pass criterion of the step being recorded (step 2 of the progression above).
    expect(byTest('log-criterion')?.textContent).toContain('Five rotations landed on the feet')
    expect(saveButton().disabled).toBe(false)

    vi.mocked(api.checkEvent).mockResolvedValue({
      checks: [
        {
          code: 'skipped-step',
          severity: 'requires-reason',
          message:
            'Moving from step 1 (Tuck jumps and timers) to step 4 (Into the foam pit) skips step 2 (Rotation in the spotting rig) and step 3 (Hand spot by a coach). State a reason for the skip.',
          skippedStepIndices: [1, 2],
        },
      ],
      plannedStepIndex: null,
    })
    choose(wrapper, 'log-step', 3)
    await settle()

    expect(api.checkEvent).toHaveBeenLastCalledWith(
      clubId,
      athleteId,
      expect.objectContaining({ kind: 'step', stepIndex: 3, expectedLastEventId: eventIds[0] }),
    )
    expect(byTest('skip-reason')?.textContent).toContain('Why skip steps? (required)')
    const check = byTest('check-skipped-step')?.textContent ?? ''
    expect(check).toContain('a reason is needed')
    expect(check).toContain('skips step 2 (Rotation in the spotting rig)')
    expect(byTest('reason-needed')?.textContent).toContain('State a reason')
    expect(saveButton().disabled).toBe(true)

    const reason = byTest('skip-reason')!.querySelector('textarea')!
    reason.value = 'Did these steps at her previous club'
    reason.dispatchEvent(new Event('input'))
    await settle()
    expect(saveButton().disabled).toBe(false)
    expect(api.checkEvent).toHaveBeenLastCalledWith(
      clubId,
      athleteId,
      expect.objectContaining({ skipReason: 'Did these steps at her previous club' }),
    )
  })

  it('shows the proposed step-down of a lost-skill pause with the safety caution once, and lets the coach change it', async () => {
    vi.mocked(api.getRecordDetail).mockResolvedValue(
      recordDetail({ stepIndex: 4, highestStepIndex: 4 }),
    )
    const { wrapper } = mountInProviders(ProgressLogPanel, props)
    await settle()

    vi.mocked(api.checkEvent).mockResolvedValue({
      checks: [
        {
          code: 'lost-skill-step-down',
          severity: 'warning',
          message: `Lost skill: step down 2 steps, from step 5 (Solo on the trampoline) to step 3 (Hand spot by a coach), and rebuild from there. ${safetyCaution}`,
          proposedStepIndex: 2,
        },
      ],
      plannedStepIndex: 2,
    })
    pick(wrapper, 'log-kind', 'pause')
    await settle()
    pick(wrapper, 'log-pause-reason', 'lost-skill')
    await settle()

    expect(api.checkEvent).toHaveBeenLastCalledWith(
      clubId,
      athleteId,
      expect.objectContaining({ kind: 'pause', pauseReason: 'lost-skill' }),
    )
    const proposal = byTest('step-down')?.textContent ?? ''
    expect(proposal).toContain('Proposed step-down')
    expect(proposal).toContain('step 3 · hand spot by a coach')
    // The caution stands once on the screen, not again in the proposal or the check.
    expect(document.body.textContent?.split(safetyCaution).length).toBe(2)
    expect(byTest('safety-note')?.textContent).toContain(safetyCaution)
    const planned = wrapper
      .findAllComponents(NSelect)
      .find((s) => s.attributes('data-test') === 'planned-step')!
    expect(planned.props('value')).toBe(2)

    // The coach chooses to rebuild from further back; the save carries that choice.
    choose(wrapper, 'planned-step', 1)
    await settle()
    expect(planned.props('value')).toBe(1)
    vi.mocked(api.recordEvent).mockResolvedValue({
      eventId: eventIds[1]!,
      record: { ...recordDetail({ stepIndex: 4 }), paused: true, pauseReason: 'lost-skill' },
      checks: [],
      replayed: false,
    })
    saveButton().click()
    await settle()
    expect(api.recordEvent).toHaveBeenCalledWith(
      clubId,
      athleteId,
      expect.objectContaining({ kind: 'pause', pauseReason: 'lost-skill', plannedStepIndex: 1 }),
    )
  })

  it('shows the current record when someone else saved first, refreshes it and keeps the entry', async () => {
    vi.mocked(api.getRecordDetail)
      .mockResolvedValueOnce(recordDetail({ stepIndex: 0 }))
      .mockResolvedValue(
        recordDetail({
          stepIndex: 2,
          highestStepIndex: 2,
          lastEventOn: '2025-02-03',
          lastEventId: eventIds[1]!,
        }),
      )
    const {
      steps: _steps,
      events: _events,
      ...current
    } = recordDetail({
      stepIndex: 2,
      highestStepIndex: 2,
      lastEventOn: '2025-02-03',
      lastEventId: eventIds[1]!,
    })
    const said = 'Someone else has just changed this record.'
    // The body as the server's error middleware writes it: the record beside the code.
    vi.mocked(api.recordEvent).mockRejectedValueOnce(
      new ApiError(409, 'conflict', said, [], {
        error: { code: 'conflict', message: said, record: current },
      }),
    )
    mountInProviders(ProgressLogPanel, props)
    await settle()
    saveButton().click()
    await settle()

    expect(api.recordEvent).toHaveBeenCalledWith(
      clubId,
      athleteId,
      expect.objectContaining({ stepIndex: 1, expectedLastEventId: eventIds[0] }),
    )
    const conflict = byTest('conflict')?.textContent ?? ''
    expect(conflict).toContain('Someone else just changed this record')
    expect(byTest('conflict-state')?.textContent).toContain(
      'Step 3 · Hand spot by a coach (3/6); last entry on 2025-02-03.',
    )
    expect(conflict).toContain('Your entry was not saved')
    expect(api.getRecordDetail).toHaveBeenCalledTimes(2)
    expect(byTest('record-step')?.textContent).toContain('Step 3 · Hand spot by a coach')

    // The coach decides again: the next save is made against the state now on screen.
    vi.mocked(api.recordEvent).mockResolvedValue({
      eventId: eventIds[1]!,
      record: recordDetail({ stepIndex: 1, lastEventId: eventIds[1]! }),
      checks: [],
      replayed: false,
    })
    saveButton().click()
    await settle()
    expect(api.recordEvent).toHaveBeenLastCalledWith(
      clubId,
      athleteId,
      expect.objectContaining({ stepIndex: 1, expectedLastEventId: eventIds[1] }),
    )
  })
})
