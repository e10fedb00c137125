import type { Placement } from '@shared/domain/planner/types'
import type {
  PlanOutcomeInput,
  PlanRequest,
  PlanResult,
  SavePlanInput,
  SavedPlan,
  SavedPlanSummary,
  Station,
  StationInput,
} from '@shared/schemas/planner'
import { request } from './http'

const club = (clubId: string) => `/clubs/${clubId}`

export const listStations = (clubId: string) =>
  request<Station[]>(`${club(clubId)}/planner/stations`)
export const createStation = (clubId: string, input: StationInput) =>
  request<Station>(`${club(clubId)}/planner/stations`, { method: 'POST', body: input })
export const deleteStation = (clubId: string, id: string) =>
  request<void>(`${club(clubId)}/planner/stations/${id}`, { method: 'DELETE' })
export const planSession = (clubId: string, input: PlanRequest) =>
  request<PlanResult>(`${club(clubId)}/planner/plan`, { method: 'POST', body: input })
export const listPlans = (clubId: string, squadId?: string) =>
  request<SavedPlanSummary[]>(`${club(clubId)}/plans`, { query: { squadId } })
export const getPlan = (clubId: string, id: string) =>
  request<SavedPlan>(`${club(clubId)}/plans/${id}`)
export const savePlan = (clubId: string, input: SavePlanInput) =>
  request<SavedPlan>(`${club(clubId)}/plans`, { method: 'POST', body: input })
export const updatePlan = (clubId: string, id: string, input: SavePlanInput) =>
  request<SavedPlan>(`${club(clubId)}/plans/${id}`, { method: 'PUT', body: input })
export const recordOutcome = (clubId: string, id: string, input: PlanOutcomeInput) =>
  request<SavedPlan>(`${club(clubId)}/plans/${id}/outcome`, { method: 'POST', body: input })

export type { Placement }
