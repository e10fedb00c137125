import { defineStore } from 'pinia'
import { ref } from 'vue'
import type {
  RecommendationInput,
  RecommendationStatusInput,
  RecommendationView,
} from '@shared/schemas/visits'
import * as api from '@/api/visits'
import type { RecommendationFilter } from '@/api/visits'

/** The key of a list: the same filter shares one list wherever it is shown. */
export const filterKey = (filter: RecommendationFilter) =>
  JSON.stringify([filter.squadId, filter.athleteId, filter.elementId, filter.visitId, filter.open])

interface List {
  items: RecommendationView[]
  loading: boolean
  error: string | null
}

/** Recommendations, one list per filter (an athlete, an element of theirs, a squad, a visit). */
export const useRecommendationsStore = defineStore('recommendations', () => {
  const lists = ref<Record<string, List>>({})
  const filters = new Map<string, RecommendationFilter>()

  /** Loads the list for a filter; its error is kept on the list for the component to show. */
  async function load(clubId: string, filter: RecommendationFilter) {
    const key = filterKey(filter)
    filters.set(key, filter)
    lists.value[key] ??= { items: [], loading: false, error: null }
    // Read back through the reactive record, so that the changes below are seen.
    const list = lists.value[key]!
    list.loading = true
    list.error = null
    try {
      list.items = await api.listRecommendations(clubId, filter)
    } catch (err) {
      list.error = err instanceof Error ? err.message : String(err)
    } finally {
      list.loading = false
    }
  }

  /** Every list shown reloads: a new or changed recommendation may belong to several. */
  async function refresh(clubId: string) {
    await Promise.all([...filters.values()].map((f) => load(clubId, f)))
  }

  /** Leaves a recommendation (clinicians). Lets the ApiError through for the form's fields. */
  async function create(clubId: string, input: RecommendationInput) {
    const created = await api.createRecommendation(clubId, input)
    await refresh(clubId)
    return created
  }

  /** Accepts, declines or marks done (coaches). Lets the ApiError through. */
  async function setStatus(clubId: string, id: string, input: RecommendationStatusInput) {
    const changed = await api.setRecommendationStatus(clubId, id, input)
    await refresh(clubId)
    return changed
  }

  return { lists, load, refresh, create, setStatus }
})
