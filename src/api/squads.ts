import type { Grid } from '@shared/schemas/progress'
import type { SquadInput, SquadView } from '@shared/schemas/squads'
import { request } from './http'

const club = (clubId: string) => `/clubs/${clubId}`

export interface GridFilters {
  apparatus?: string | null
  rotationClass?: 'none' | 'single' | 'double' | 'triple' | null
}

export const listSquads = (clubId: string) => request<SquadView[]>(`${club(clubId)}/squads`)
export const getSquad = (clubId: string, squadId: string) =>
  request<SquadView>(`${club(clubId)}/squads/${squadId}`)
export const createSquad = (clubId: string, input: SquadInput) =>
  request<SquadView>(`${club(clubId)}/squads`, { method: 'POST', body: input })
export const updateSquad = (clubId: string, squadId: string, input: SquadInput) =>
  request<SquadView>(`${club(clubId)}/squads/${squadId}`, { method: 'PATCH', body: input })
export const setSquadCoaches = (clubId: string, squadId: string, userIds: string[]) =>
  request<SquadView>(`${club(clubId)}/squads/${squadId}/coaches`, {
    method: 'PUT',
    body: { userIds },
  })

export const getSquadGrid = (clubId: string, squadId: string, filters: GridFilters = {}) =>
  request<Grid>(`${club(clubId)}/squads/${squadId}/grid`, {
    query: { apparatus: filters.apparatus, rotationClass: filters.rotationClass },
  })
