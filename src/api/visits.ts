import type {
  RecommendationInput,
  RecommendationStatusInput,
  RecommendationView,
  VisitInput,
  VisitUpdate,
  VisitView,
} from '@shared/schemas/visits'
import { request } from './http'

const club = (clubId: string) => `/clubs/${clubId}`

export interface RecommendationFilter {
  squadId?: string
  athleteId?: string
  elementId?: string
  visitId?: string
  open?: boolean
}

export const listVisits = (clubId: string) => request<VisitView[]>(`${club(clubId)}/visits`)
export const createVisit = (clubId: string, input: VisitInput) =>
  request<VisitView>(`${club(clubId)}/visits`, { method: 'POST', body: input })
export const updateVisit = (clubId: string, visitId: string, input: VisitUpdate) =>
  request<VisitView>(`${club(clubId)}/visits/${visitId}`, { method: 'PATCH', body: input })
export const cancelVisit = (clubId: string, visitId: string) =>
  request<VisitView>(`${club(clubId)}/visits/${visitId}/cancel`, { method: 'POST' })

export const listRecommendations = (clubId: string, filter: RecommendationFilter = {}) =>
  request<RecommendationView[]>(`${club(clubId)}/recommendations`, {
    query: { ...filter, open: filter.open === undefined ? undefined : String(filter.open) },
  })
export const createRecommendation = (clubId: string, input: RecommendationInput) =>
  request<RecommendationView>(`${club(clubId)}/recommendations`, { method: 'POST', body: input })
export const setRecommendationStatus = (
  clubId: string,
  id: string,
  input: RecommendationStatusInput,
) =>
  request<RecommendationView>(`${club(clubId)}/recommendations/${id}/status`, {
    method: 'POST',
    body: input,
  })
