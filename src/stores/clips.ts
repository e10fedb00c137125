import { defineStore } from 'pinia'
import * as api from '@/api/clips'
import type { ClipFilter } from '@/api/clips'
import { filteredLists } from './filtered-lists'

/** The key of a list: the same filter shares one list wherever it is shown. */
export const clipFilterKey = (filter: ClipFilter) =>
  JSON.stringify([filter.athleteId, filter.elementId, filter.squadId, filter.unreviewed])

/** Clips of attempts, one list per filter (an athlete, an element of theirs, my review queue). */
export const useClipsStore = defineStore('clips', () => {
  const { lists, load, refresh } = filteredLists(clipFilterKey, api.listClips)

  /** Uploads a clip, reporting progress; lets the ApiError through for a retry. */
  async function upload(
    clubId: string,
    input: { athleteId: string; elementId: string; file: File },
    onProgress: (fraction: number) => void,
  ) {
    const clip = await api.uploadClip(clubId, input, onProgress)
    await refresh(clubId)
    return clip
  }

  /** Marks a clip reviewed (clinicians); it leaves the review queue. Lets the ApiError through. */
  async function markReviewed(clubId: string, clipId: string) {
    await api.markClipReviewed(clubId, clipId)
    await refresh(clubId)
  }

  return { lists, load, refresh, upload, markReviewed }
})
