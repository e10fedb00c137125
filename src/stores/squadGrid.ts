import { defineStore } from 'pinia'
import { reactive, ref } from 'vue'
import type { RotationClass } from '@shared/domain/element'
import type { Grid } from '@shared/schemas/progress'
import * as api from '@/api/squads'

/** The grid filters as the controls hold them: a cleared select is null. */
export interface GridFilterState {
  apparatus: string | null
  rotationClass: RotationClass | null
}

/** A squad's athletes × elements grid, filtered on the server. */
export const useSquadGridStore = defineStore('squadGrid', () => {
  const grid = ref<Grid | null>(null)
  const filters = reactive<GridFilterState>({ apparatus: null, rotationClass: null })
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
      if (mine === serial) grid.value = answer
    } catch (err) {
      if (mine === serial) error.value = err instanceof Error ? err.message : String(err)
    } finally {
      if (mine === serial) loading.value = false
    }
  }

  function resetFilters() {
    filters.apparatus = null
    filters.rotationClass = null
  }

  return { grid, filters, loading, error, load, resetFilters }
})
