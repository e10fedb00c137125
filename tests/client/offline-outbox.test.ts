import { createPinia, setActivePinia } from 'pinia'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import { replayRecord, type ProgressEvent } from '@shared/domain/progress'
import type { ProgressEventInput, RecordView } from '@shared/schemas/progress'
import { ApiError } from '@/api/http'
import * as api from '@/api/progress'
import type { OutboxEntry } from '@/offline/outbox-db'
import { predictRecord } from '@/offline/predict'
import { useOutboxStore } from '@/stores/outbox'
import { useSessionStore } from '@/stores/session'
import { athleteId, clubId, elementId, recordDetail } from './progress-helpers'

vi.mock('@/api/progress', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/progress')>()),
  recordEvent: vi.fn(),
}))
// The tablet's keeping, in memory: what the store asks of IndexedDB.
const kept = new Map<string, OutboxEntry>()
/** What was done to the tablet's keeping, in order. */
const keeping: string[] = []
vi.mock('@/offline/outbox-db', () => ({
  listEntries: async () => [...kept.values()].sort((a, b) => a.seq - b.seq),
  putEntry: async (e: OutboxEntry) => void kept.set(e.clientEventId, e),
  settleEntry: async (id: string, eventId: string | null) => {
    keeping.push('settle')
    for (const e of kept.values())
      if (eventId && e.input.expectedLastEventId === id) e.input.expectedLastEventId = eventId
    kept.delete(id)
  },
  closeOutbox: async () => undefined,
}))
vi.mock('@/offline/caches', () => ({
  clearOfflineData: async () => {
    keeping.push('clear')
    kept.clear()
  },
  forgetApiAnswers: async () => undefined,
}))

const uuid = (n: number) => `00000000-0000-4000-8000-${String(n).padStart(12, '0')}`

// The records below are replayed by replayRecord (shared/domain/progress.ts), the server's own
// replay: the prediction of one more event must match the replay of the history with it.
const toEvent = (input: ProgressEventInput, id: string, n: number): ProgressEvent =>
  ({
    id,
    occurredOn: input.occurredOn,
    recordedAt: `2025-03-0${n}T10:00:00Z`,
    coachId: 'coach',
    ...(input.kind === 'step'
      ? { kind: 'step', stepIndex: input.stepIndex! }
      : input.kind === 'pause'
        ? {
            kind: 'pause',
            reason: input.pauseReason!,
            plannedStepIndex: input.plannedStepIndex ?? undefined,
          }
        : { kind: 'resume' }),
  }) as ProgressEvent

const entry = (
  kind: ProgressEventInput['kind'],
  extra: Partial<ProgressEventInput>,
  n: number,
): ProgressEventInput & { clientEventId: string } => ({
  elementId,
  kind,
  occurredOn: `2025-03-0${n}`,
  expectedLastEventId: null,
  ...extra,
  clientEventId: uuid(n),
})

function viewOf(events: ProgressEvent[], lastId: string | null): RecordView {
  const r = replayRecord(events)
  return {
    athleteId,
    elementId,
    stepIndex: r.stepIndex,
    highestStepIndex: r.highestStepIndex,
    stepReachedOn: r.stepReachedOn,
    paused: r.paused,
    pauseReason: r.pauseReason,
    plannedStepIndex: r.plannedStepIndex,
    lastEventOn: r.lastEventOn,
    lastEventId: lastId,
    flagged: false,
  }
}

describe('predictRecord', () => {
  // Hand-worked history (common practice, no published source): step 1, step 2, step 4, a
  // lost-skill pause planning a return to step 2, a step 3 during the pause, then a resume.
  const history = [
    entry('step', { stepIndex: 0 }, 1),
    entry('step', { stepIndex: 1 }, 2),
    entry('step', { stepIndex: 3 }, 3),
    entry('pause', { pauseReason: 'lost-skill', plannedStepIndex: 1 }, 4),
    entry('step', { stepIndex: 2 }, 5),
    entry('pause', { pauseReason: 'lost-skill', plannedStepIndex: 0 }, 6),
    entry('resume', {}, 7),
  ]
  it.each(history.map((e, i) => [i + 1, e.kind, i] as const))(
    'event %i (%s) gives what the replay gives',
    (_n, _kind, i) => {
      const events = history.slice(0, i).map((e, k) => toEvent(e, e.clientEventId, k + 1))
      const before = viewOf(events, i === 0 ? null : history[i - 1]!.clientEventId)
      const after = viewOf(
        [...events, toEvent(history[i]!, history[i]!.clientEventId, i + 1)],
        history[i]!.clientEventId,
      )
      expect(predictRecord(before, history[i]!)).toEqual(after)
    },
  )
})

function keep(n: number, input: ProgressEventInput & { clientEventId: string }) {
  return useOutboxStore().enqueue({
    clientEventId: input.clientEventId,
    clubId,
    athleteId,
    athleteName: 'Mia Novak',
    elementName: 'Back tuck',
    input,
    predicted: recordDetail({ stepIndex: n }),
  })
}

beforeEach(() => {
  kept.clear()
  keeping.length = 0
  setActivePinia(createPinia())
  vi.mocked(api.recordEvent).mockReset()
})

describe('useOutboxStore', () => {
  it('sends kept entries in the order made, each expecting the event the one before became', async () => {
    const outbox = useOutboxStore()
    outbox.online = false
    await keep(0, entry('step', { stepIndex: 0, expectedLastEventId: null }, 1))
    await keep(1, entry('step', { stepIndex: 1, expectedLastEventId: uuid(1) }, 2))
    expect(outbox.waiting).toHaveLength(2)
    const served = [uuid(101), uuid(102)]
    vi.mocked(api.recordEvent).mockImplementation(async (_c, _a, input) => ({
      eventId: served[vi.mocked(api.recordEvent).mock.calls.length - 1]!,
      record: recordDetail({ stepIndex: input.stepIndex ?? null }),
      checks: [],
      replayed: false,
    }))
    outbox.online = true
    await outbox.flush()
    const sent = vi.mocked(api.recordEvent).mock.calls.map((c) => c[2])
    expect(sent.map((s) => [s.clientEventId, s.expectedLastEventId])).toEqual([
      [uuid(1), null],
      [uuid(2), uuid(101)],
    ])
    expect(outbox.entries).toHaveLength(0)
    expect(kept.size).toBe(0)
  })

  it('stops at a network failure and keeps every entry for the next chance', async () => {
    const outbox = useOutboxStore()
    await keep(0, entry('step', { stepIndex: 0 }, 1))
    vi.mocked(api.recordEvent).mockRejectedValue(new ApiError(0, 'network', 'unreachable'))
    await outbox.flush()
    expect(outbox.waiting).toHaveLength(1)
    expect(kept.size).toBe(1)
  })

  it('keeps a refused entry with the server’s words, holds back its record’s later entries, and sends the others', async () => {
    const outbox = useOutboxStore()
    const otherElement = '66666666-6666-4666-8666-666666666666'
    await keep(0, entry('step', { stepIndex: 0 }, 1))
    await keep(1, entry('step', { stepIndex: 1, expectedLastEventId: uuid(1) }, 2))
    await keep(0, { ...entry('step', { stepIndex: 0 }, 3), elementId: otherElement })
    const { steps: _s, events: _e, ...current } = recordDetail({ stepIndex: 2 })
    vi.mocked(api.recordEvent).mockImplementation(async (_c, _a, input) => {
      if (input.elementId === elementId)
        throw new ApiError(409, 'conflict', 'Someone else has just changed this record.', [], {
          error: { record: current },
        })
      return { eventId: uuid(103), record: recordDetail(), checks: [], replayed: false }
    })
    await outbox.flush()
    expect(vi.mocked(api.recordEvent).mock.calls.map((c) => c[2].clientEventId)).toEqual([
      uuid(1),
      uuid(3),
    ])
    expect(outbox.refused.map((e) => [e.clientEventId, e.refusal])).toEqual([
      [uuid(1), 'Someone else has just changed this record.'],
    ])
    expect(outbox.refused[0]!.current?.stepIndex).toBe(2)
    expect(outbox.waiting.map((e) => e.clientEventId)).toEqual([uuid(2)])
    // Nothing is dropped: the refused entry and the one behind it stay on the tablet.
    expect([...kept.keys()].sort()).toEqual([uuid(1), uuid(2)])
  })

  it('sends a refused entry again on the record as it now stands, or discards it', async () => {
    const outbox = useOutboxStore()
    await keep(0, entry('step', { stepIndex: 3 }, 1))
    const {
      steps: _s,
      events: _e,
      ...current
    } = recordDetail({
      stepIndex: 2,
      lastEventId: uuid(50),
    })
    vi.mocked(api.recordEvent).mockRejectedValueOnce(
      new ApiError(409, 'conflict', 'Changed.', [], { error: { record: current } }),
    )
    await outbox.flush()
    expect(outbox.refused).toHaveLength(1)
    vi.mocked(api.recordEvent).mockResolvedValueOnce({
      eventId: uuid(104),
      record: recordDetail({ stepIndex: 3 }),
      checks: [],
      replayed: false,
    })
    await outbox.retry(uuid(1))
    expect(vi.mocked(api.recordEvent).mock.calls[1]![2].expectedLastEventId).toBe(uuid(50))
    expect(outbox.entries).toHaveLength(0)

    await keep(0, entry('step', { stepIndex: 0 }, 2))
    await outbox.discard(uuid(2))
    expect(outbox.entries).toHaveLength(0)
    expect(kept.size).toBe(0)
  })
})

describe('useOutboxStore on a tablet shared by two people', () => {
  const signedInAs = (id: string) => {
    useSessionStore().me = { user: { id } } as never
  }

  it('sends only the entries of the person signed in, and the others once their maker is back', async () => {
    const outbox = useOutboxStore()
    outbox.online = false
    signedInAs('coach-a')
    await keep(0, entry('step', { stepIndex: 0 }, 1))
    signedInAs('coach-b')
    expect(outbox.waiting).toHaveLength(0)
    expect(outbox.latestFor(athleteId, elementId)).toBeUndefined()
    vi.mocked(api.recordEvent).mockResolvedValue({
      eventId: uuid(101),
      record: recordDetail({ stepIndex: 0 }),
      checks: [],
      replayed: false,
    })
    outbox.online = true
    await outbox.flush()
    expect(api.recordEvent).not.toHaveBeenCalled()
    expect(kept.size).toBe(1)

    signedInAs('coach-a')
    expect(outbox.waiting).toHaveLength(1)
    await outbox.flush()
    expect(api.recordEvent).toHaveBeenCalledTimes(1)
    expect(kept.size).toBe(0)
  })

  it('keeps nothing from a send that ends after sign-out, and sends nothing more', async () => {
    const outbox = useOutboxStore()
    outbox.online = false
    signedInAs('coach-a')
    await keep(0, entry('step', { stepIndex: 0 }, 1))
    await keep(1, entry('step', { stepIndex: 1, expectedLastEventId: uuid(1) }, 2))
    let answer: (value: Awaited<ReturnType<typeof api.recordEvent>>) => void = () => {}
    vi.mocked(api.recordEvent).mockImplementationOnce(
      () => new Promise((resolve) => (answer = resolve)),
    )
    outbox.online = true
    const sending = outbox.flush()
    await vi.waitFor(() => expect(api.recordEvent).toHaveBeenCalledTimes(1))
    const clearing = outbox.clear()
    answer({
      eventId: uuid(101),
      record: recordDetail({ stepIndex: 0 }),
      checks: [],
      replayed: false,
    })
    await Promise.all([sending, clearing])
    expect(api.recordEvent).toHaveBeenCalledTimes(1)
    expect(keeping).toEqual(['clear'])
    expect(outbox.entries).toHaveLength(0)
    expect(kept.size).toBe(0)
  })
})
