import { computed, reactive, watch, type Ref } from 'vue'
import type { ShownRow } from '@/offline/batchRows'
import { newEntryId } from '@/offline/predict'

type RowKey = Pick<ShownRow, 'athleteId' | 'elementId'>

export const rowKey = (row: RowKey) => `${row.athleteId}|${row.elementId}`

/**
 * The ticks of the squad logging list. A tick remembers the newest event its row showed and
 * lasts only while that row can still be ticked and its record has not moved (after a reload,
 * a save, or an entry of the tablet being sent); the entry id a tick carries goes with it, and
 * stays the same until the entry is saved, so that a retry after a lost answer repeats it.
 */
export function useBatchTicks(rows: Ref<ShownRow[]>) {
  const ticked = reactive(new Map<string, string | null>())
  const clientIds = new Map<string, string>()
  // Field errors of the last save, by row: a new tick on the row clears its error.
  const rowErrors = reactive<Record<string, string>>({})

  const tickable = (row: ShownRow) => row.nextStep !== null
  const isTicked = (row: RowKey) => ticked.has(rowKey(row))

  watch(rows, (list) => {
    const byKey = new Map(list.map((r) => [rowKey(r), r]))
    for (const [key, lastEventId] of [...ticked]) {
      const row = byKey.get(key)
      if (row && tickable(row) && row.lastEventId === lastEventId) continue
      forget(key)
    }
  })

  function tick(row: ShownRow, on: boolean) {
    const key = rowKey(row)
    if (on && tickable(row)) ticked.set(key, row.lastEventId)
    else ticked.delete(key)
    delete rowErrors[key]
  }
  function allTicked(list: ShownRow[]) {
    const open = list.filter(tickable)
    return open.length > 0 && open.every(isTicked)
  }
  const someTicked = (list: ShownRow[]) => list.some(isTicked) && !allTicked(list)
  function tickAll(list: ShownRow[], on: boolean) {
    for (const row of list.filter(tickable)) tick(row, on)
  }

  /** The entry id of a ticked row, made once. */
  function idFor(row: RowKey) {
    const key = rowKey(row)
    if (!clientIds.has(key)) clientIds.set(key, newEntryId())
    return clientIds.get(key)!
  }
  function forget(key: string) {
    ticked.delete(key)
    clientIds.delete(key)
  }
  function clear() {
    ticked.clear()
    clientIds.clear()
  }
  /** New entry ids for every tick (after a refusal whose entries were not saved). */
  const renewIds = () => clientIds.clear()

  const chosen = computed(() => rows.value.filter((r) => tickable(r) && isTicked(r)))

  return {
    rowErrors,
    chosen,
    tickable,
    isTicked,
    tick,
    allTicked,
    someTicked,
    tickAll,
    idFor,
    forget,
    clear,
    renewIds,
  }
}
