import type { AthleteInput, AthleteUpdate, AthleteView } from '@shared/schemas/athletes'
import type { ImportResult } from '@shared/schemas/catalogue'
import type { AthleteErasure } from '@shared/schemas/erasure'
import { request } from './http'

const club = (clubId: string) => `/clubs/${clubId}`

export interface AthleteListQuery {
  squadId?: string
  includeArchived?: boolean
}

export const listAthletes = (clubId: string, query: AthleteListQuery = {}) =>
  request<AthleteView[]>(`${club(clubId)}/athletes`, {
    // The server reads only the literal 'true'; leaving it out means active athletes only.
    query: { squadId: query.squadId, includeArchived: query.includeArchived ? 'true' : undefined },
  })
export const getAthlete = (clubId: string, athleteId: string) =>
  request<AthleteView>(`${club(clubId)}/athletes/${athleteId}`)
export const addAthlete = (clubId: string, input: AthleteInput) =>
  request<AthleteView>(`${club(clubId)}/athletes`, { method: 'POST', body: input })
export const updateAthlete = (clubId: string, athleteId: string, update: AthleteUpdate) =>
  request<AthleteView>(`${club(clubId)}/athletes/${athleteId}`, { method: 'PATCH', body: update })

/** Erases the athlete for good (directors): their history, records and name in reports. */
export const eraseAthlete = (clubId: string, athleteId: string, input: AthleteErasure) =>
  request<void>(`${club(clubId)}/athletes/${athleteId}/erase`, { method: 'POST', body: input })

export const importRoster = (clubId: string, rows: Record<string, unknown>[], dryRun: boolean) =>
  request<ImportResult>(`${club(clubId)}/athletes/import`, {
    method: 'POST',
    body: { rows, dryRun },
  })

/** The CSV export is a plain download link, not a fetch: the browser saves the file itself. */
export const rosterExportUrl = (clubId: string, squadId?: string) =>
  `/api${club(clubId)}/athletes/export${squadId ? `?squadId=${encodeURIComponent(squadId)}` : ''}`
