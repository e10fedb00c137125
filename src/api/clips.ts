import type { ClipView } from '@shared/schemas/clips'
import { request } from './http'
import { uploadFile } from './upload'

const club = (clubId: string) => `/clubs/${clubId}`

export interface ClipFilter {
  athleteId?: string
  elementId?: string
  squadId?: string
  /** Only those I have not marked reviewed (clinicians). */
  unreviewed?: boolean
}

export const listClips = (clubId: string, filter: ClipFilter = {}) =>
  request<ClipView[]>(`${club(clubId)}/clips`, {
    query: {
      ...filter,
      unreviewed: filter.unreviewed === undefined ? undefined : String(filter.unreviewed),
    },
  })

export const uploadClip = (
  clubId: string,
  input: { athleteId: string; elementId: string; file: File; note?: string },
  onProgress?: (fraction: number) => void,
) =>
  uploadFile<ClipView>(`${club(clubId)}/clips`, input.file, {
    query: {
      athleteId: input.athleteId,
      elementId: input.elementId,
      fileName: input.file.name.slice(0, 200),
      note: input.note,
    },
    onProgress,
  })

export const markClipReviewed = (clubId: string, clipId: string) =>
  request<ClipView>(`${club(clubId)}/clips/${clipId}/reviewed`, { method: 'POST' })

/** The address a video element plays the clip from (range requests through the server). */
export const clipVideoUrl = (clubId: string, clipId: string) =>
  `/api${club(clubId)}/clips/${clipId}/video`
