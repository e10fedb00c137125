import { defineStore } from 'pinia'
import type { RecommendationInput, RecommendationStatusInput } from '@shared/schemas/visits'
import * as api from '@/api/visits'
import type { RecommendationFilter } from '@/api/visits'
import { filteredLists } from './filtered-lists'

/** The key of a list: the same filter shares one list wherever it is shown. */
export const filterKey = (filter: RecommendationFilter) =>
  JSON.stringify([filter.squadId, filter.athleteId, filter.elementId, filter.visitId, filter.open])

/** Recommendations, one list per filter (an athlete, an element of theirs, a squad, a visit). */
export const useRecommendationsStore = defineStore('recommendations', () => {
  const { lists, load, refresh } = filteredLists(filterKey, api.listRecommendations)

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
