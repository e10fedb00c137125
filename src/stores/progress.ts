import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import type {
  EventResult,
  ProgressEventInput,
  RecordDetail,
  RecordView,
} from '@shared/schemas/progress'
import type { CatalogueElement } from '@shared/schemas/elements'
import { listElements } from '@/api/elements'
import { ApiError } from '@/api/http'
import * as api from '@/api/progress'
import { newEntryId, predictRecord } from '@/offline/predict'
import { useOutboxStore } from './outbox'

/** A save's answer: the server's, or, with `queued`, the entry kept on the tablet to send later. */
export type SaveOutcome = EventResult & { queued?: boolean }

const keyOf = (athleteId: string, elementId: string) => `${athleteId}|${elementId}`

const blankRecord = (athleteId: string, elementId: string): RecordView => ({
  athleteId,
  elementId,
  stepIndex: null,
  highestStepIndex: null,
  stepReachedOn: null,
  paused: false,
  pauseReason: null,
  plannedStepIndex: null,
  lastEventOn: null,
  lastEventId: null,
  flagged: false,
})

/**
 * The log flow of the gym floor: the catalogue to pick from, the record being logged (its
 * steps and events) and the checks and saving of an event.
 */
export const useProgressStore = defineStore('progress', () => {
  const elements = ref<CatalogueElement[]>([])
  const elementsClubId = ref<string | null>(null)
  const elementsLoading = ref(false)
  const elementsError = ref<string | null>(null)

  const detail = ref<RecordDetail | null>(null)
  const detailKey = ref<string | null>(null)
  const detailLoading = ref(false)
  const detailError = ref<string | null>(null)

  const elementById = computed(() => new Map(elements.value.map((e) => [e.id, e])))
  const outbox = useOutboxStore()
  outbox.onSent((result) => adoptRecord(result.record))

  /** The club's catalogue, loaded once per club (it changes rarely during a session). */
  async function loadElements(clubId: string, options: { force?: boolean } = {}) {
    if (!options.force && elementsClubId.value === clubId && elements.value.length > 0) return
    elementsLoading.value = true
    elementsError.value = null
    try {
      elements.value = await listElements(clubId)
      elementsClubId.value = clubId
    } catch (err) {
      elementsError.value = err instanceof Error ? err.message : String(err)
    } finally {
      elementsLoading.value = false
    }
  }

  /** One athlete's record for one element, with its steps and events; the error is kept. */
  async function loadDetail(clubId: string, athleteId: string, elementId: string) {
    const key = keyOf(athleteId, elementId)
    if (detailKey.value !== key) detail.value = null
    detailKey.value = key
    detailLoading.value = true
    detailError.value = null
    try {
      const loaded = await api.getRecordDetail(clubId, athleteId, elementId)
      // Entries still on the tablet are part of the record as the coach knows it.
      const kept = outbox.latestFor(athleteId, elementId)
      // A coach who picked another element meanwhile must not see this one's answer.
      if (detailKey.value === key) detail.value = kept ? { ...loaded, ...kept.predicted } : loaded
    } catch (err) {
      if (detailKey.value === key)
        detailError.value = err instanceof Error ? err.message : String(err)
    } finally {
      if (detailKey.value === key) detailLoading.value = false
    }
  }

  function clearDetail() {
    detail.value = null
    detailKey.value = null
    detailError.value = null
  }

  /** Previews the checks of an event; nothing is saved. Lets the ApiError through. */
  async function check(clubId: string, athleteId: string, input: ProgressEventInput) {
    return api.checkEvent(clubId, athleteId, input)
  }

  /**
   * Saves an event under an id made here, and shows the new state at once. Offline, or while
   * earlier entries still wait, the entry is kept on the tablet instead and sent in order later
   * (`queued`, with the state it will give). A 409 (someone else wrote first) and a missing skip
   * reason come through as the ApiError.
   */
  async function save(
    clubId: string,
    athleteId: string,
    input: ProgressEventInput,
    names: { athleteName?: string; elementName?: string } = {},
  ): Promise<SaveOutcome> {
    const entry = { ...input, clientEventId: input.clientEventId ?? newEntryId() }
    if (outbox.online && outbox.waiting.length === 0) {
      try {
        const result = await api.recordEvent(clubId, athleteId, entry)
        adoptRecord(result.record)
        if (detailKey.value === keyOf(athleteId, input.elementId))
          await loadDetail(clubId, athleteId, input.elementId)
        return result
      } catch (err) {
        // Only an unreachable server keeps the entry; every answer of the server stands.
        if (!(err instanceof ApiError && err.status === 0)) throw err
      }
    }
    const base =
      detailKey.value === keyOf(athleteId, input.elementId) && detail.value
        ? detail.value
        : blankRecord(athleteId, input.elementId)
    const { steps: _steps, events: _events, ...before } = { steps: [], events: [], ...base }
    const predicted = predictRecord(before, entry)
    await outbox.enqueue({
      clientEventId: entry.clientEventId,
      clubId,
      athleteId,
      athleteName: names.athleteName ?? '',
      elementName: names.elementName ?? '',
      input: entry,
      predicted,
    })
    adoptRecord(predicted)
    if (outbox.online) void outbox.flush()
    return {
      eventId: entry.clientEventId,
      record: predicted,
      checks: [],
      replayed: false,
      queued: true,
    }
  }

  /** Shows a record state the server answered (after a save, or with a 409). */
  function adoptRecord(record: RecordView) {
    if (detail.value && detailKey.value === keyOf(record.athleteId, record.elementId)) {
      detail.value = { ...detail.value, ...record }
    }
  }

  return {
    elements,
    elementsLoading,
    elementsError,
    elementById,
    detail,
    detailLoading,
    detailError,
    loadElements,
    loadDetail,
    clearDetail,
    check,
    save,
    adoptRecord,
  }
})
