import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { ApiError } from '@/api/http'
import * as progressApi from '@/api/progress'
import * as api from '@/api/progressBatch'
import ProgressBatchPanel from '@/components/progress/ProgressBatchPanel.vue'
import { notKeptMessage } from '@/composables/useBatchList'
import type { OutboxEntry } from '@/offline/outbox-db'
import { useOutboxStore } from '@/stores/outbox'
import { athletes, byTest, checkbox, preview, row, save, settle, squadId } from './batch-helpers'
import { clubId, elementId, eventIds, mountInProviders, steps } from './progress-helpers'

// Squad logging without a network: the list the service worker kept, entries kept on the
// tablet one per athlete, and the list moved on by them. The progression is the helpers' back
// tuck (6 steps; common practice, no published source); the expected steps are worked by hand.

vi.mock('@/api/progressBatch', () => ({ listBatch: vi.fn(), saveBatch: vi.fn() }))
vi.mock('@/api/progress', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/progress')>()),
  recordEvent: vi.fn(),
}))
const kept = new Map<string, OutboxEntry>()
vi.mock('@/offline/outbox-db', () => ({
  listEntries: async () => [...kept.values()].sort((a, b) => a.seq - b.seq),
  putEntry: async (e: OutboxEntry) => void kept.set(e.clientEventId, e),
  settleEntry: async (id: string) => void kept.delete(id),
  closeOutbox: async () => undefined,
}))

const atTop = row(1, {
  stepIndex: 5,
  highestStepIndex: 5,
  nextStep: null,
  lastEventId: eventIds[1]!,
})

// Ada 0's step 2 (index 1) on 3 Nov, kept on the tablet.
const keptEntry = (tabletId: string, status: OutboxEntry['status']): OutboxEntry => ({
  clientEventId: tabletId,
  seq: 1,
  clubId,
  athleteId: athletes[0]!,
  athleteName: 'Ada 0 Quill',
  elementName: 'Back tuck',
  input: {
    elementId,
    kind: 'step',
    stepIndex: 1,
    occurredOn: '2026-11-03',
    clientEventId: tabletId,
    expectedLastEventId: eventIds[0]!,
  },
  predicted: {
    athleteId: athletes[0]!,
    elementId,
    stepIndex: 1,
    highestStepIndex: 1,
    stepReachedOn: '2026-11-03',
    paused: false,
    pauseReason: null,
    plannedStepIndex: null,
    lastEventOn: '2026-11-03',
    lastEventId: tabletId,
    flagged: false,
  },
  madeAt: '2026-11-03T10:00:00Z',
  status,
  refusal: status === 'refused' ? 'Someone else has just changed this athlete’s record.' : null,
  current: null,
})

const mount = () =>
  mountInProviders(ProgressBatchPanel, { clubId, squadId, elementId, counterpartId: null })

beforeEach(() => {
  kept.clear()
  vi.mocked(api.listBatch).mockReset()
  vi.mocked(api.saveBatch).mockReset()
  vi.mocked(progressApi.recordEvent).mockReset()
  vi.mocked(progressApi.recordEvent).mockRejectedValue(
    new ApiError(0, 'network', 'Twofold cannot be reached.'),
  )
})
afterEach(() => {
  document.body.innerHTML = ''
})

describe('ProgressBatchPanel offline', () => {
  it('keeps one entry per ticked athlete on the tablet, in list order, and shows the steps they give', async () => {
    vi.mocked(api.listBatch).mockResolvedValue(
      preview([
        row(0),
        atTop,
        row(2, {
          stepIndex: null,
          highestStepIndex: null,
          stepReachedOn: null,
          lastEventOn: null,
          lastEventId: null,
          nextStep: { index: 0, name: steps[0]!.name, criterion: steps[0]!.criterion },
        }),
      ]),
    )
    const { wrapper } = mount()
    await settle()
    const outbox = useOutboxStore()
    outbox.online = false
    await settle()
    expect(byTest('batch-offline')[0]!.textContent).toContain(
      'all of them run again when the entries are sent',
    )

    checkbox(wrapper, 0).vm.$emit('update:checked', true)
    await settle()
    save().click()
    await settle()
    expect(api.saveBatch).not.toHaveBeenCalled()
    const entries = [...kept.values()].sort((a, b) => a.seq - b.seq)
    expect(
      entries.map((e) => [e.athleteId, e.input.stepIndex, e.input.expectedLastEventId]),
    ).toEqual([
      [athletes[0], 1, eventIds[0]],
      [athletes[2], 0, null],
    ])
    expect(entries[0]).toMatchObject({
      athleteName: 'Ada 0 Quill',
      elementName: 'Back tuck',
      input: { kind: 'step', clientEventId: entries[0]!.clientEventId },
      predicted: { stepIndex: 1, lastEventId: entries[0]!.clientEventId },
    })
    expect(document.body.textContent).toContain('Kept on this tablet, waiting to send: 2 entries')
    // Ada 0 now on step 2 of 6, step 3 next; Ada 2 on step 1, step 2 next; ticks are gone.
    const rows = byTest('batch-row').map((r) => r.textContent ?? '')
    expect(rows[0]).toContain('now 2/6')
    expect(rows[0]).toContain('Next: step 3 · Hand spot by a coach')
    expect(rows[0]).toContain('entry kept on this tablet')
    // Step 2 is held at least 7 days (the helpers' progression) and was reached today: passing
    // step 3 today would be early, which the tablet says before anything is sent.
    expect(rows[0]).toContain(
      'Step 2 (Rotation in the spotting rig) is passed after 0 days; its minimum is 7 days.',
    )
    expect(rows[1]).not.toContain('kept')
    expect(rows[2]).toContain('Next: step 2 · Rotation in the spotting rig')
    expect(save().textContent).toContain('Save 0 entries')
  })

  it('says plainly when the list was never kept on this tablet', async () => {
    vi.mocked(api.listBatch).mockRejectedValue(
      new ApiError(0, 'network', 'Twofold cannot be reached.'),
    )
    mount()
    await settle()
    expect(document.body.textContent).toContain(notKeptMessage)
    expect(notKeptMessage).toContain('has not been opened on this tablet while online')
  })

  it('keeps the entries under the same ids when the server cannot be reached while saving', async () => {
    vi.mocked(api.listBatch).mockResolvedValue(preview([row(0), row(2)]))
    const { wrapper } = mount()
    await settle()
    checkbox(wrapper, 0).vm.$emit('update:checked', true)
    await settle()
    vi.mocked(api.saveBatch).mockRejectedValueOnce(
      new ApiError(0, 'network', 'Twofold cannot be reached.'),
    )
    save().click()
    await settle()
    const sent = vi.mocked(api.saveBatch).mock.calls[0]![2].entries!.map((e) => e.clientEventId)
    const entries = [...kept.values()].sort((a, b) => a.seq - b.seq)
    expect(entries.map((e) => e.clientEventId)).toEqual(sent)
    expect(document.body.textContent).toContain('Kept on this tablet, waiting to send: 2 entries')
    expect(document.body.textContent).not.toContain('Nothing was saved')
  })

  it('shows each row as the server answered once its kept entry is sent, then reads the list again', async () => {
    const tabletId = '77777777-7777-4777-8777-777777777702'
    const stored = '44444444-4444-4444-8444-444444444403'
    kept.set(tabletId, keptEntry(tabletId, 'waiting'))
    vi.mocked(api.listBatch).mockResolvedValue(preview([row(0)]))
    mount()
    await settle()
    const outbox = useOutboxStore()
    outbox.online = false
    await outbox.load()
    await settle()
    expect(byTest('batch-row')[0]!.textContent).toContain('entry kept on this tablet')

    // The server stores it: step 2 (index 1) reached on 3 Nov, as the entry said.
    const record = {
      ...keptEntry(tabletId, 'waiting').predicted,
      lastEventId: stored,
      flagged: true,
    }
    vi.mocked(progressApi.recordEvent).mockResolvedValueOnce({
      eventId: stored,
      record,
      checks: [],
      replayed: false,
    })
    vi.mocked(api.listBatch).mockResolvedValue(
      preview([row(0, { ...record, nextStep: { index: 2, name: steps[2]!.name, criterion: '' } })]),
    )
    outbox.online = true
    await outbox.flush()
    await settle()
    expect(kept.size).toBe(0)
    const shown = byTest('batch-row')[0]!.textContent ?? ''
    expect(shown).toContain('now 2/6')
    expect(shown).toContain('Next: step 3 · Hand spot by a coach')
    expect(shown).not.toContain('kept')
    expect(api.listBatch).toHaveBeenCalledTimes(2)
  })

  it('online, sends an athlete whose entry is still kept through the outbox, after that entry', async () => {
    const tabletId = '77777777-7777-4777-8777-777777777701'
    kept.set(tabletId, keptEntry(tabletId, 'refused'))
    vi.mocked(api.listBatch).mockResolvedValue(preview([row(0)]))
    const { wrapper } = mount()
    await useOutboxStore().load()
    await settle()
    expect(byTest('batch-row')[0]!.textContent).toContain('Next: step 3 · Hand spot by a coach')
    checkbox(wrapper, 1).vm.$emit('update:checked', true)
    await settle()
    save().click()
    await settle()
    expect(api.saveBatch).not.toHaveBeenCalled()
    const added = [...kept.values()].find((e) => e.seq === 2)!
    expect(added.input).toMatchObject({ stepIndex: 2, expectedLastEventId: tabletId })
    expect(added.predicted).toMatchObject({ stepIndex: 2, highestStepIndex: 2 })
  })

  it('past midnight, reads the list again before saving and says which day its checks are for', async () => {
    // 23:59 on 4 November, then 00:01 on 5 November (local time), before Save.
    vi.useFakeTimers({ toFake: ['Date'] })
    try {
      vi.setSystemTime(new Date(2026, 10, 4, 23, 59))
      vi.mocked(api.listBatch).mockResolvedValue(preview([row(0)]))
      const { wrapper } = mount()
      await settle()
      const outbox = useOutboxStore()
      checkbox(wrapper, 0).vm.$emit('update:checked', true)
      await settle()
      vi.setSystemTime(new Date(2026, 10, 5, 0, 1))
      save().click()
      await settle()
      // Online: read again for the new day, nothing saved.
      expect(vi.mocked(api.listBatch).mock.calls.at(-1)![2]).toMatchObject({
        occurredOn: '2026-11-05',
      })
      expect(document.body.textContent).toContain(
        'It is now 2026-11-05: the list shows today’s checks. Look again, then save.',
      )
      expect(api.saveBatch).not.toHaveBeenCalled()

      // Offline the list read again is the one the tablet kept: its checks are of its own day.
      outbox.online = false
      vi.setSystemTime(new Date(2026, 10, 6, 0, 1))
      checkbox(wrapper, 0).vm.$emit('update:checked', true)
      await settle()
      save().click()
      await settle()
      expect(document.body.textContent).toContain(
        'It is now 2026-11-06: look again, then save. Offline, the checks shown are those of the day the list was opened here',
      )
      expect(kept.size).toBe(0)
    } finally {
      vi.useRealTimers()
    }
  })
})
