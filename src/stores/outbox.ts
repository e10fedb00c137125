import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import type { EventResult } from '@shared/schemas/progress'
import { ApiError } from '@/api/http'
import { conflictRecord, recordEvent } from '@/api/progress'
import { clearOfflineData } from '@/offline/caches'
import { useSessionStore } from './session'
import {
  closeOutbox,
  listEntries,
  putEntry,
  settleEntry,
  type OutboxEntry,
} from '@/offline/outbox-db'

const recordKey = (e: Pick<OutboxEntry, 'athleteId'> & { input: { elementId: string } }) =>
  `${e.athleteId}:${e.input.elementId}`

/**
 * Progress entries kept on the tablet (IndexedDB) until the server has them: made offline, or
 * behind others still waiting. They are sent in the order made when the network returns; one the
 * server refuses (a conflict, a check that needs a reason) stays, with the server's words, for the
 * coach to send again or discard, and holds back the later entries on the same record.
 */
export const useOutboxStore = defineStore('outbox', () => {
  const entries = ref<OutboxEntry[]>([])
  const online = ref(typeof navigator === 'undefined' ? true : navigator.onLine)
  const sending = ref(false)
  const loaded = ref(false)
  const sentListeners = new Set<(result: EventResult) => void>()
  const session = useSessionStore()
  // Set at sign-out: a send under way stores nothing more on the tablet, and none starts.
  let stopping = false
  let sendingDone: Promise<void> = Promise.resolve()

  /** The entries of the person signed in (and any kept before entries named their maker). */
  const mine = computed(() => {
    const me = session.me?.user.id ?? null
    return entries.value.filter((e) => !e.madeBy || e.madeBy === me)
  })
  const waiting = computed(() => mine.value.filter((e) => e.status === 'waiting'))
  const refused = computed(() => mine.value.filter((e) => e.status === 'refused'))

  /** Reads the kept entries (after a reload) and sends any that wait. */
  async function load() {
    stopping = false
    try {
      entries.value = await listEntries()
    } catch {
      entries.value = []
    }
    loaded.value = true
    if (online.value) void flush()
  }

  /** The newest kept entry on a record, whose predicted state the screens show. */
  function latestFor(athleteId: string, elementId: string): OutboxEntry | undefined {
    return [...mine.value]
      .reverse()
      .find((e) => e.athleteId === athleteId && e.input.elementId === elementId)
  }

  /** Keeps an entry on the tablet; it is sent after those made before it. */
  async function enqueue(
    entry: Omit<OutboxEntry, 'seq' | 'status' | 'refusal' | 'current' | 'madeAt'>,
  ) {
    const seq = Math.max(0, ...entries.value.map((e) => e.seq)) + 1
    const kept: OutboxEntry = {
      ...entry,
      madeBy: session.me?.user.id ?? null,
      seq,
      madeAt: new Date().toISOString(),
      status: 'waiting',
      refusal: null,
      current: null,
    }
    await putEntry(JSON.parse(JSON.stringify(kept)) as OutboxEntry)
    entries.value = [...entries.value, kept]
  }

  /** Hears of each entry the server has stored (to show its record). Answers the way to stop. */
  function onSent(listener: (result: EventResult) => void) {
    sentListeners.add(listener)
    return () => sentListeners.delete(listener)
  }

  async function refuse(entry: OutboxEntry, refusal: string, current: OutboxEntry['current']) {
    const updated = { ...entry, status: 'refused' as const, refusal, current }
    await putEntry(JSON.parse(JSON.stringify(updated)) as OutboxEntry)
    entries.value = entries.value.map((e) =>
      e.clientEventId === entry.clientEventId ? updated : e,
    )
  }

  /**
   * Sends the waiting entries in the order made. Stops at the first network failure (the rest
   * wait for the next chance); a refusal is kept for the coach and holds back its record only.
   */
  async function flush() {
    if (sending.value || stopping) return
    sending.value = true
    let done = () => {}
    sendingDone = new Promise((resolve) => (done = resolve))
    try {
      for (const { clientEventId } of [...waiting.value].sort((a, b) => a.seq - b.seq)) {
        if (stopping) return
        // Read afresh: sending an earlier entry rewrites what this one expects.
        const entry = entries.value.find((e) => e.clientEventId === clientEventId)
        if (!entry || entry.status !== 'waiting') continue
        const key = recordKey(entry)
        const heldBack = refused.value.some((r) => recordKey(r) === key && r.seq < entry.seq)
        if (heldBack) continue
        let result: EventResult
        try {
          result = await recordEvent(entry.clubId, entry.athleteId, entry.input)
        } catch (err) {
          if (!(err instanceof ApiError) || err.status === 0 || err.status >= 500) return
          if (err.status === 401 || stopping) return
          await refuse(entry, err.message, conflictRecord(err))
          continue
        }
        // Signed out meanwhile: the tablet keeps nothing more (the server has the entry).
        if (stopping) return
        await settleEntry(entry.clientEventId, result.eventId)
        entries.value = entries.value
          .filter((e) => e.clientEventId !== entry.clientEventId)
          .map((e) =>
            e.input.expectedLastEventId === entry.clientEventId
              ? { ...e, input: { ...e.input, expectedLastEventId: result.eventId } }
              : e,
          )
        for (const listener of sentListeners) listener(result)
      }
    } finally {
      sending.value = false
      done()
    }
  }

  /**
   * Sends a refused entry again on top of the record as the server last answered it: the coach
   * has read where the record stands and keeps the entry.
   */
  async function retry(clientEventId: string) {
    const entry = entries.value.find((e) => e.clientEventId === clientEventId)
    if (!entry) return
    const updated: OutboxEntry = {
      ...entry,
      status: 'waiting',
      refusal: null,
      input: {
        ...entry.input,
        expectedLastEventId: entry.current
          ? entry.current.lastEventId
          : entry.input.expectedLastEventId,
      },
    }
    await putEntry(JSON.parse(JSON.stringify(updated)) as OutboxEntry)
    entries.value = entries.value.map((e) => (e.clientEventId === clientEventId ? updated : e))
    await flush()
  }

  /** Drops a refused entry the coach decided against; nothing of it reaches the server. */
  async function discard(clientEventId: string) {
    await settleEntry(clientEventId, null)
    entries.value = entries.value.filter((e) => e.clientEventId !== clientEventId)
  }

  /**
   * At sign-out: forgets every kept entry (anyone's) and the kept API answers, once a send under
   * way has ended, so that nothing writes to the tablet afterwards.
   */
  async function clear() {
    stopping = true
    await sendingDone
    entries.value = []
    await closeOutbox()
    await clearOfflineData()
  }

  if (typeof window !== 'undefined') {
    window.addEventListener('online', () => {
      online.value = true
      void flush()
    })
    window.addEventListener('offline', () => {
      online.value = false
    })
  }

  return {
    entries,
    waiting,
    refused,
    online,
    sending,
    loaded,
    load,
    latestFor,
    enqueue,
    onSent,
    flush,
    retry,
    discard,
    clear,
  }
})
