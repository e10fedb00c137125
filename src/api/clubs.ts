import type { ClubView } from '@shared/schemas/clubs'
import type { ClubDeletion } from '@shared/schemas/erasure'
import { request } from './http'

export const getClub = (clubId: string) => request<ClubView>(`/clubs/${clubId}/`)

/** Deletes the club and everything in it for good (directors), once its name is typed. */
export const deleteClub = (clubId: string, input: ClubDeletion) =>
  request<void>(`/clubs/${clubId}`, { method: 'DELETE', body: input })
