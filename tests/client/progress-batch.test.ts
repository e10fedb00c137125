import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { ApiError } from '@/api/http'
import * as api from '@/api/progressBatch'
import ProgressBatchPanel from '@/components/progress/ProgressBatchPanel.vue'
import type { OutboxEntry } from '@/offline/outbox-db'
import {
  athletes,
  batchSteps,
  byTest,
  checkbox,
  preview,
  row,
  save,
  settle,
  squadId,
} from './batch-helpers'
import { clubId, elementId, eventIds, mountInProviders } from './progress-helpers'

vi.mock('@/api/progressBatch', () => ({ listBatch: vi.fn(), saveBatch: vi.fn() }))
// The tablet's keeping, in memory: what the outbox asks of IndexedDB.
const kept = new Map<string, OutboxEntry>()
vi.mock('@/offline/outbox-db', () => ({
  listEntries: async () => [...kept.values()].sort((a, b) => a.seq - b.seq),
  putEntry: async (e: OutboxEntry) => void kept.set(e.clientEventId, e),
  settleEntry: async (id: string) => void kept.delete(id),
  closeOutbox: async () => undefined,
}))

beforeEach(() => {
  kept.clear()
  vi.mocked(api.listBatch).mockReset()
  vi.mocked(api.saveBatch).mockReset()
})
afterEach(() => {
  document.body.innerHTML = ''
})

describe('ProgressBatchPanel', () => {
  it('shows each athlete’s next step and criterion, ticks all who can pass on, and saves them once', async () => {
    vi.mocked(api.listBatch).mockResolvedValue(
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
    expect(api.listBatch).toHaveBeenCalledTimes(2)
  })

  it('asks for a skip reason where a check needs one and puts the server’s refusal on that athlete', async () => {
    const needs = {
      code: 'skipped-step' as const,
      severity: 'requires-reason' as const,
      message: 'Moving straight to step 2 skips step 1. State a reason for the skip.',
    }
    vi.mocked(api.listBatch).mockResolvedValue(preview([row(0), row(1, { checks: [needs] })]))
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

  it('after a 409 keeps only the ticks whose records did not move, marks the stale row, and saves with new ids', async () => {
    const moved = '44444444-4444-4444-8444-444444444499'
    vi.mocked(api.listBatch)
      .mockResolvedValueOnce(preview([row(0), row(1), row(2)]))
      .mockResolvedValueOnce(
        preview([
          row(0, { lastEventId: moved, stepIndex: 1 }),
          row(1),
          row(2, { stepIndex: 5, nextStep: null }),
        ]),
      )
    const { wrapper } = mountInProviders(ProgressBatchPanel, {
      clubId,
      squadId,
      elementId,
      counterpartId: null,
    })
    await settle()
    checkbox(wrapper, 0).vm.$emit('update:checked', true)
    await settle()
    expect(save().textContent).toContain('Save 3 entries')
    const message = 'Someone else has just changed this athlete’s record.'
    vi.mocked(api.saveBatch).mockRejectedValueOnce(
      new ApiError(409, 'conflict', message, [
        { path: 'entries.0.expectedLastEventId', message: 'Changed by someone else.' },
      ]),
    )
    save().click()
    await settle()
    const firstIds = vi.mocked(api.saveBatch).mock.calls[0]![2].entries!.map((e) => e.clientEventId)
    // Athlete 0's record moved and athlete 2 reached the top: only athlete 1 stays ticked.
    expect(save().textContent).toContain('Save 1 entry')
    expect(byTest('batch-row')[0]!.querySelector('[role="alert"]')?.textContent).toContain(
      'Changed by someone else.',
    )
    vi.mocked(api.saveBatch).mockResolvedValueOnce({ results: [] })
    save().click()
    await settle()
    const [, , body] = vi.mocked(api.saveBatch).mock.calls[1]!
    expect(body.entries!.map((e) => e.athleteId)).toEqual([athletes[1]])
    expect(body.entries![0]!.clientEventId).not.toBe(firstIds[1])
  })

  it('after an entry id met with other details, reloads without claiming nothing was ever saved', async () => {
    vi.mocked(api.listBatch).mockResolvedValue(preview([row(0)]))
    const { wrapper } = mountInProviders(ProgressBatchPanel, {
      clubId,
      squadId,
      elementId,
      counterpartId: null,
    })
    await settle()
    checkbox(wrapper, 1).vm.$emit('update:checked', true)
    await settle()
    vi.mocked(api.saveBatch).mockRejectedValueOnce(
      new ApiError(409, 'client_event_reused', 'This entry’s id was already used.', [
        { path: 'entries.0.clientEventId', message: 'Already used for a different entry.' },
      ]),
    )
    save().click()
    await settle()
    expect(api.listBatch).toHaveBeenCalledTimes(2)
    const alerts = [...document.querySelectorAll('[role="alert"]')].map((a) => a.textContent)
    expect(alerts.some((t) => t?.includes('Nothing was saved'))).toBe(false)
    expect(alerts.some((t) => t?.includes('check the ticks'))).toBe(true)
    vi.mocked(api.saveBatch).mockResolvedValueOnce({ results: [] })
    save().click()
    await settle()
    const ids = vi.mocked(api.saveBatch).mock.calls.map(([, , b]) => b.entries![0]!.clientEventId)
    expect(ids[1]).not.toBe(ids[0])
  })

  it('never stays saving when the entries cannot be built', async () => {
    vi.mocked(api.listBatch).mockResolvedValue(preview([row(0)]))
    const { wrapper } = mountInProviders(ProgressBatchPanel, {
      clubId,
      squadId,
      elementId,
      counterpartId: null,
    })
    await settle()
    checkbox(wrapper, 1).vm.$emit('update:checked', true)
    await settle()
    const uuid = vi.spyOn(crypto, 'randomUUID').mockImplementationOnce(() => {
      throw new Error('No random source')
    })
    save().click()
    await settle()
    expect(document.body.textContent).toContain('No random source')
    uuid.mockRestore()
    vi.mocked(api.saveBatch).mockResolvedValueOnce({ results: [] })
    save().click()
    await settle()
    expect(api.saveBatch).toHaveBeenCalledTimes(1)
  })

  it('logs for the day of saving, showing the new day’s checks first after midnight', async () => {
    vi.useFakeTimers({ toFake: ['Date'] })
    try {
      vi.setSystemTime(new Date(2026, 10, 2, 23, 58))
      vi.mocked(api.listBatch).mockResolvedValue(preview([row(0)]))
      const { wrapper } = mountInProviders(ProgressBatchPanel, {
        clubId,
        squadId,
        elementId,
        counterpartId: null,
      })
      await settle()
      expect(byTest('batch-date')[0]!.textContent).toContain('2026-11-02')
      checkbox(wrapper, 1).vm.$emit('update:checked', true)
      await settle()
      vi.setSystemTime(new Date(2026, 10, 3, 0, 2))
      save().click()
      await settle()
      expect(api.saveBatch).not.toHaveBeenCalled()
      expect(vi.mocked(api.listBatch).mock.calls[1]![2].occurredOn).toBe('2026-11-03')
      expect(byTest('batch-date')[0]!.textContent).toContain('2026-11-03')
      vi.mocked(api.saveBatch).mockResolvedValueOnce({ results: [] })
      save().click()
      await settle()
      expect(vi.mocked(api.saveBatch).mock.calls[0]![2].occurredOn).toBe('2026-11-03')
    } finally {
      vi.useRealTimers()
    }
  })

  it('names each pair member’s "select all" after its element', async () => {
    const mirror = '33333333-3333-4333-8333-333333333399'
    vi.mocked(api.listBatch).mockResolvedValue({
      ...preview([row(0), row(0, { elementId: mirror })]),
      elements: [
        {
          id: elementId,
          name: 'Back tuck',
          direction: 'backward',
          stepCount: 6,
          steps: batchSteps,
        },
        { id: mirror, name: 'Front tuck', direction: 'forward', stepCount: 6, steps: batchSteps },
      ],
    })
    mountInProviders(ProgressBatchPanel, {
      clubId,
      squadId,
      elementId,
      counterpartId: mirror,
    })
    await settle()
    const names = byTest('batch-select-all').map((el) => el.textContent?.trim())
    expect(names).toEqual([
      'Select all who can pass on Back tuck',
      'Select all who can pass on Front tuck',
    ])
  })
})
