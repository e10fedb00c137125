import { flushPromises, type VueWrapper } from '@vue/test-utils'
import { NRadioGroup } from 'naive-ui'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { safetyCaution } from '@shared/domain/element'
import { ApiError } from '@/api/http'
import * as api from '@/api/progress'
import ProgressQuickLog from '@/components/progress/ProgressQuickLog.vue'
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

const squadId = '55555555-5555-4555-8555-555555555555'
const props = {
  clubId,
  squadId,
  athleteId,
  elementId,
  athleteName: 'Mia Novak',
  elementName: 'Back tuck',
}

const byTest = (name: string) => document.querySelector<HTMLElement>(`[data-test="${name}"]`)
const saveButton = () => byTest('quick-save') as HTMLButtonElement

async function settle() {
  await flushPromises()
  await wait(5)
  await flushPromises()
}

function pick(wrapper: VueWrapper, name: string, value: string) {
  const group = wrapper.findAllComponents(NRadioGroup).find((g) => g.props('name') === name)
  if (!group) throw new Error(`no radio group ${name}`)
  group.vm.$emit('update:value', value)
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

describe('ProgressQuickLog', () => {
  it("shows the current step, the next step's name and its pass criterion, and the caution once", async () => {
    // At step 2 of 6 ("Rotation in the spotting rig"): the next is step 3, the hand spot.
    vi.mocked(api.getRecordDetail).mockResolvedValue(recordDetail({ stepIndex: 1 }))
    mountInProviders(ProgressQuickLog, props)
    await settle()
    expect(byTest('quick-current')!.textContent).toContain('2/6')
    expect(byTest('quick-current')!.textContent).toContain('Rotation in the spotting rig')
    expect(byTest('quick-next')!.textContent).toContain('Hand spot by a coach')
    expect(byTest('quick-criterion')!.textContent).toContain('Three in a row with a light spot')
    expect(document.body.textContent!.split(safetyCaution)).toHaveLength(2)
    expect(saveButton().textContent).toContain('Passed step 3')
  })

  it('asks the checks of "passed the next step" on opening and saves it in one tap when none is raised', async () => {
    vi.mocked(api.getRecordDetail).mockResolvedValue(recordDetail({ stepIndex: 1 }))
    const saved = recordDetail({ stepIndex: 2, lastEventId: eventIds[1]! })
    vi.mocked(api.recordEvent).mockResolvedValue({
      record: saved,
      checks: [],
      eventId: eventIds[1]!,
      replayed: false,
    })
    const { wrapper } = mountInProviders(ProgressQuickLog, props)
    await settle()
    expect(api.checkEvent).toHaveBeenCalledTimes(1)
    expect(byTest('checks-clear')).not.toBeNull()
    saveButton().click()
    await settle()
    expect(api.recordEvent).toHaveBeenCalledTimes(1)
    const [, , sent] = vi.mocked(api.recordEvent).mock.calls[0]!
    expect(sent).toMatchObject({
      elementId,
      kind: 'step',
      stepIndex: 2,
      expectedLastEventId: eventIds[0],
    })
    const shell = wrapper.findComponent(ProgressQuickLog)
    expect(shell.emitted('saved')?.[0]?.[0]).toMatchObject({ record: { stepIndex: 2 } })
  })

  it('shows a check (an early pass) before the save, and saves on the tap after it is read', async () => {
    vi.mocked(api.getRecordDetail).mockResolvedValue(recordDetail({ stepIndex: 0 }))
    vi.mocked(api.checkEvent).mockResolvedValue({
      checks: [
        {
          code: 'min-days',
          severity: 'warning',
          message: 'Passed after 2 days; the step asks for at least 7.',
        },
      ],
      plannedStepIndex: null,
    })
    vi.mocked(api.recordEvent).mockResolvedValue({
      record: recordDetail({ stepIndex: 1 }),
      checks: [],
      eventId: eventIds[1]!,
      replayed: false,
    })
    mountInProviders(ProgressQuickLog, props)
    await settle()
    // The check is on screen before anything is saved.
    expect(byTest('check-min-days')).not.toBeNull()
    expect(api.recordEvent).not.toHaveBeenCalled()
    saveButton().click()
    await settle()
    expect(api.recordEvent).toHaveBeenCalledTimes(1)
  })

  it('keeps the entry unsaved and shows where the record stands after a conflict', async () => {
    vi.mocked(api.getRecordDetail).mockResolvedValue(recordDetail({ stepIndex: 1 }))
    const now = recordDetail({ stepIndex: 3, lastEventId: eventIds[1]! })
    const { steps: _steps, events: _events, ...record } = now
    vi.mocked(api.recordEvent).mockRejectedValue(
      new ApiError(409, 'conflict', 'Changed meanwhile', [], { error: { record } }),
    )
    mountInProviders(ProgressQuickLog, props)
    await settle()
    vi.mocked(api.getRecordDetail).mockResolvedValue(now)
    saveButton().click()
    await settle()
    expect(document.body.textContent).toContain('Someone else just changed this record')
    expect(byTest('quick-current')!.textContent).toContain('4/6')
  })

  it('offers resume for a paused record and pause with a reason otherwise', async () => {
    vi.mocked(api.getRecordDetail).mockResolvedValue(
      recordDetail({ stepIndex: 2, paused: true, pauseReason: 'injury' }),
    )
    vi.mocked(api.recordEvent).mockResolvedValue({
      record: recordDetail({ stepIndex: 2 }),
      checks: [],
      eventId: eventIds[1]!,
      replayed: false,
    })
    const { wrapper } = mountInProviders(ProgressQuickLog, props)
    await settle()
    expect(saveButton().textContent).toContain('Resume training')
    saveButton().click()
    await settle()
    expect(vi.mocked(api.recordEvent).mock.calls[0]![2]).toMatchObject({ kind: 'resume' })

    pick(wrapper, 'quick-action', 'pause')
    await settle()
    // No reason chosen yet: nothing to save.
    expect(saveButton().disabled).toBe(true)
    pick(wrapper, 'quick-pause-reason', 'fear')
    await settle()
    saveButton().click()
    await settle()
    expect(vi.mocked(api.recordEvent).mock.calls[1]![2]).toMatchObject({
      kind: 'pause',
      pauseReason: 'fear',
    })
  })

  it('links to the full form for the same athlete and element', async () => {
    vi.mocked(api.getRecordDetail).mockResolvedValue(recordDetail({ stepIndex: 1 }))
    mountInProviders(ProgressQuickLog, props)
    await settle()
    const link = [...document.querySelectorAll('a')].find((a) =>
      a.textContent?.includes('full form'),
    )!
    expect(link.getAttribute('href')).toBe(
      `/log?squadId=${squadId}&athleteId=${athleteId}&elementId=${elementId}`,
    )
  })
})
