import { defineStore } from 'pinia'
import { reactive, ref, watch } from 'vue'
import type { RotationClass } from '@shared/domain/element'
import type { Grid, RecordView } from '@shared/schemas/progress'
import * as api from '@/api/squads'
import { useOutboxStore } from './outbox'

/** The grid filters as the controls hold them: a cleared select is null. */
export interface GridFilterState {
  apparatus: string | null
  rotationClass: RotationClass | null
}

/** A squad's athletes × elements grid, filtered on the server. */
export const useSquadGridStore = defineStore('squadGrid', () => {
  const grid = ref<Grid | null>(null)
  const outbox = useOutboxStore()
  const filters = reactive<GridFilterState>({ apparatus: null, rotationClass: null })
  /** Pairs nobody in the squad has started are left out unless asked for. */
  const hideUnstarted = ref(true)
  const loading = ref(false)
  const error = ref<string | null>(null)
  let serial = 0

  /** Loads the grid with the current filters; only the latest answer is shown. */
  async function load(clubId: string, squadId: string) {
    const mine = ++serial
    loading.value = true
    error.value = null
    if (grid.value?.squad.id !== squadId) grid.value = null
    try {
      const answer = await api.getSquadGrid(clubId, squadId, { ...filters })
      if (mine === serial) {
        grid.value = answer
        // Entries still on the tablet show as they will stand once sent.
        for (const entry of outbox.entries) applyRecord(entry.predicted)
      }
    } catch (err) {
      if (mine === serial) error.value = err instanceof Error ? err.message : String(err)
    } finally {
      if (mine === serial) loading.value = false
    }
  }

  /**
   * Puts a record the server just answered into its cell, so that a logged step shows without a
   * reload. A record of an athlete or element not on the grid changes nothing.
   */
  function applyRecord(record: RecordView) {
    const g = grid.value
    if (!g) return
    const i = g.athletes.findIndex((a) => a.id === record.athleteId)
    const j = g.columns.findIndex((c) => c.elementId === record.elementId)
    const row = g.cells[i]
    if (i === -1 || j === -1 || !row) return
    row[j] = { step: record.stepIndex, paused: record.paused, flagged: record.flagged }
  }

  // Entries kept on the tablet (read from IndexedDB after a reload, or just made) show in their
  // cells as they will stand once sent.
  watch(
    () => outbox.entries,
    (list) => {
      for (const entry of list) applyRecord(entry.predicted)
    },
  )

  function resetFilters() {
    filters.apparatus = null
    filters.rotationClass = null
  }

  return { grid, filters, hideUnstarted, loading, error, load, applyRecord, resetFilters }
})
