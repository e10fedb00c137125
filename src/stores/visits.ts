import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { VisitInput, VisitUpdate, VisitView } from '@shared/schemas/visits'
import * as api from '@/api/visits'

/** The club's visits (directors) or the clinician's own. */
export const useVisitsStore = defineStore('visits', () => {
  const visits = ref<VisitView[]>([])
  const loading = ref(false)
  const error = ref<string | null>(null)

  function put(visit: VisitView) {
    const known = visits.value.some((v) => v.id === visit.id)
    visits.value = known
      ? visits.value.map((v) => (v.id === visit.id ? visit : v))
      : [visit, ...visits.value]
  }

  /** Loads the visits; the error is kept for the view to show. */
  async function load(clubId: string) {
    loading.value = true
    error.value = null
    try {
      visits.value = await api.listVisits(clubId)
    } catch (err) {
      error.value = err instanceof Error ? err.message : String(err)
    } finally {
      loading.value = false
    }
  }

  /** Schedules a visit (directors). Lets the ApiError through for the form's fields. */
  async function create(clubId: string, input: VisitInput) {
    const visit = await api.createVisit(clubId, input)
    put(visit)
    return visit
  }

  /** Changes a visit's dates, squads or agenda. Lets the ApiError through. */
  async function update(clubId: string, visitId: string, input: VisitUpdate) {
    const visit = await api.updateVisit(clubId, visitId, input)
    put(visit)
    return visit
  }

  /** Cancels a visit: the clinician's access through it ends. */
  async function cancel(clubId: string, visitId: string) {
    put(await api.cancelVisit(clubId, visitId))
  }

  return { visits, loading, error, load, create, update, cancel }
})
