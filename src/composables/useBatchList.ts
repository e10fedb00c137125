import { computed, onScopeDispose, ref, watch } from 'vue'
import type { BatchPreview } from '@shared/schemas/progress-batch'
import { ApiError } from '@/api/http'
import { listBatch } from '@/api/progressBatch'
import { localToday } from '@/components/progress/progressFormat'
import { rowAt, shownRows, type ShownRow } from '@/offline/batchRows'
import { useOutboxStore } from '@/stores/outbox'

export interface BatchListSource {
  clubId: string
  squadId: string
  elementId: string
  counterpartId: string | null
}

/** Shown when the network fails and the service worker has kept no copy of this list. */
export const notKeptMessage =
  'Twofold cannot be reached, and this list has not been opened on this tablet while online, so it cannot be shown offline. Open it once with a connection to keep it here.'

/**
 * The squad logging list: loaded with the GET that the service worker keeps (so that a list
 * opened online shows offline too), and shown with the entries still kept on the tablet applied
 * (`shownRows`). As the outbox sends, each row takes the record the server answered; once it
 * has finished, the list is read again for the checks of the new state.
 */
export function useBatchList(source: () => BatchListSource) {
  const outbox = useOutboxStore()
  const preview = ref<BatchPreview | null>(null)
  const loading = ref(false)
  const loadError = ref<string | null>(null)
  // The day the entries are logged for: today when the list is loaded and again when saving.
  const occurredOn = ref(localToday())
  let asked = 0

  async function load() {
    const { clubId, squadId, elementId, counterpartId } = source()
    const ask = ++asked
    loading.value = true
    loadError.value = null
    occurredOn.value = localToday()
    try {
      const answer = await listBatch(clubId, squadId, {
        elementId,
        counterpartId: counterpartId ?? undefined,
        occurredOn: occurredOn.value,
      })
      if (ask === asked) preview.value = answer
    } catch (err) {
      if (ask !== asked) return
      preview.value = null
      loadError.value =
        err instanceof ApiError && err.status === 0
          ? notKeptMessage
          : err instanceof Error
            ? err.message
            : String(err)
    } finally {
      if (ask === asked) loading.value = false
    }
  }

  // latestFor reads the outbox's entries: the list follows every change of them.
  const rows = computed<ShownRow[]>(() =>
    preview.value ? shownRows(preview.value, outbox.latestFor, occurredOn.value) : [],
  )
  const sections = computed(() =>
    (preview.value?.elements ?? []).map((element) => ({
      element,
      rows: rows.value.filter((r) => r.elementId === element.id),
    })),
  )

  const sentSome = ref(false)
  const stopSent = outbox.onSent(({ record }) => {
    sentSome.value = true
    const list = preview.value
    const element = list?.elements.find((e) => e.id === record.elementId)
    if (!list || !element) return
    preview.value = {
      ...list,
      rows: list.rows.map((row) =>
        row.athleteId === record.athleteId && row.elementId === record.elementId
          ? rowAt(row, element.steps, record, occurredOn.value)
          : row,
      ),
    }
  })
  watch(
    () => outbox.sending,
    (sending) => {
      if (sending || !sentSome.value || !preview.value) return
      sentSome.value = false
      void load()
    },
  )
  onScopeDispose(() => stopSent())

  return { preview, rows, sections, loading, loadError, occurredOn, load }
}
