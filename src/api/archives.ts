import type { ClubArchiveJob } from '@shared/schemas/archives'
import { request } from './http'

const archives = (clubId: string) => `/clubs/${clubId}/archives`

/** Starts an archive of everything the club holds (directors); a worker builds it. */
export const startArchive = (clubId: string) =>
  request<ClubArchiveJob>(archives(clubId), { method: 'POST' })
export const getArchive = (clubId: string, id: string) =>
  request<ClubArchiveJob>(`${archives(clubId)}/${id}`)
/** The zip itself, for a link: the browser saves it under the name the server gives. */
export const archiveDownloadUrl = (clubId: string, id: string) =>
  `/api${archives(clubId)}/${id}/download`
