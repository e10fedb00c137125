import { flushPromises, type VueWrapper } from '@vue/test-utils'
import { NCheckbox } from 'naive-ui'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import type { BatchPreview, BatchRow } from '@shared/schemas/progress-batch'
import { ApiError } from '@/api/http'
import * as api from '@/api/progressBatch'
import ProgressBatchPanel from '@/components/progress/ProgressBatchPanel.vue'
import { clubId, elementId, eventIds, mountInProviders, wait } from './progress-helpers'

vi.mock('@/api/progressBatch', () => ({ previewBatch: vi.fn(), saveBatch: vi.fn() }))

const squadId = '55555555-5555-4555-8555-555555555555'
const athletes = [
  '66666666-6666-4666-8666-666666666601',
  '66666666-6666-4666-8666-666666666602',
  '66666666-6666-4666-8666-666666666603',
]
// A common trampoline progression for a back tuck (common practice, no published source).
const row = (i: number, partial: Partial<BatchRow> = {}): BatchRow => ({
  athleteId: athletes[i]!,
  givenName: `Ada ${i}`,
  familyName: 'Quill',
  elementId,
  stepIndex: 0,
  paused: false,
  lastEventId: eventIds[0]!,
  nextStep: {
    index: 1,
    name: 'Rotation in the spotting rig',
    criterion: 'Five rotations landed on the feet',
  },
  checks: [],
  entryIndex: null,
  ...partial,
})
const preview = (rows: BatchRow[]): BatchPreview => ({
  squad: { id: squadId, name: 'Kites' },
  elements: [{ id: elementId, name: 'Back tuck', direction: 'backward', stepCount: 6 }],
  rows,
})

const byTest = (name: string) => [
  ...document.querySelectorAll<HTMLElement>(`[data-test="${name}"]`),
]
async function settle() {
  await flushPromises()
  await wait(5)
  await flushPromises()
}
const checkbox = (wrapper: VueWrapper, i: number) => wrapper.findAllComponents(NCheckbox)[i]!
const save = () => byTest('batch-save')[0] as HTMLButtonElement

beforeEach(() => {
  vi.mocked(api.previewBatch).mockReset()
  vi.mocked(api.saveBatch).mockReset()
})
afterEach(() => {
  document.body.innerHTML = ''
})

describe('ProgressBatchPanel', () => {
  it('shows each athlete’s next step and criterion, ticks all who can pass on, and saves them once', async () => {
    vi.mocked(api.previewBatch).mockResolvedValue(
      preview([
        row(0),
        row(1, { stepIndex: 5, nextStep: null }),
        row(2, {
          stepIndex: null,
          lastEventId: null,
          nextStep: {
            index: 0,
            name: 'Tuck jumps and timers',
            criterion: 'Ten tuck jumps in a row',
          },
        }),
      ]),
    )
    const { wrapper } = mountInProviders(ProgressBatchPanel, {
      clubId,
      squadId,
      elementId,
      counterpartId: null,
    })
    await settle()
    const text = document.body.textContent ?? ''
    expect(text).toContain('Next: step 2 · Rotation in the spotting rig')
    expect(text).toContain('Pass when: Five rotations landed on the feet')
    expect(text).toContain('On the last step')
    expect(save().disabled).toBe(true)

    // Index 0 is "select all"; the athlete at the top cannot be ticked.
    checkbox(wrapper, 0).vm.$emit('update:checked', true)
    await settle()
    expect(save().textContent).toContain('Save 2 entries')

    vi.mocked(api.saveBatch).mockResolvedValue({ results: [] })
    save().click()
    await settle()
    expect(api.saveBatch).toHaveBeenCalledTimes(1)
    const [, , body] = vi.mocked(api.saveBatch).mock.calls[0]!
    expect(body.entries).toEqual([
      expect.objectContaining({
        athleteId: athletes[0],
        stepIndex: 1,
        expectedLastEventId: eventIds[0],
      }),
      expect.objectContaining({ athleteId: athletes[2], stepIndex: 0, expectedLastEventId: null }),
    ])
    expect(body.entries![0]!.clientEventId).toMatch(/^[0-9a-f-]{36}$/)
    expect(api.previewBatch).toHaveBeenCalledTimes(2)
  })

  it('asks for a skip reason where a check needs one and puts the server’s refusal on that athlete', async () => {
    const needs = {
      code: 'skipped-step' as const,
      severity: 'requires-reason' as const,
      message: 'Moving straight to step 2 skips step 1. State a reason for the skip.',
    }
    vi.mocked(api.previewBatch).mockResolvedValue(preview([row(0), row(1, { checks: [needs] })]))
    const { wrapper } = mountInProviders(ProgressBatchPanel, {
      clubId,
      squadId,
      elementId,
      counterpartId: null,
    })
    await settle()
    expect(document.body.textContent).toContain('State a reason for the skip.')
    expect(document.querySelector('[aria-label="Reason for the skip, Ada 1 Quill"]')).toBeNull()
    checkbox(wrapper, 0).vm.$emit('update:checked', true)
    await settle()
    expect(document.querySelector('[aria-label="Reason for the skip, Ada 1 Quill"]')).not.toBeNull()

    vi.mocked(api.saveBatch).mockRejectedValue(
      new ApiError(400, 'reason_required', needs.message, [
        { path: 'entries.1.skipReason', message: needs.message },
      ]),
    )
    save().click()
    await settle()
    const alerts = [...document.querySelectorAll('[role="alert"]')].map((a) => a.textContent)
    expect(alerts.some((t) => t?.includes('Nothing was saved'))).toBe(true)
    const second = byTest('batch-row')[1]!
    expect(second.querySelector('[role="alert"]')?.textContent).toContain('State a reason')
  })
})
