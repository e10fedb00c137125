import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { DueAthlete } from '@shared/schemas/progress'
import * as api from '@/api/progress'

/** Athletes of the person's squads with nothing logged for a while: what a coach has due. */
export const useProgressDueStore = defineStore('progressDue', () => {
  const athletes = ref<DueAthlete[]>([])
  const days = ref(28)
  const loading = ref(false)
  const error = ref<string | null>(null)

  /** Loads the list for the club; the error is kept for the view to show. */
  async function load(clubId: string) {
    loading.value = true
    error.value = null
    try {
      athletes.value = await api.listProgressDue(clubId, days.value)
    } catch (err) {
      error.value = err instanceof Error ? err.message : String(err)
    } finally {
      loading.value = false
    }
  }

  return { athletes, days, loading, error, load }
})
