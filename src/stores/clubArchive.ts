import { defineStore } from 'pinia'
import type { ClubArchiveJob } from '@shared/schemas/archives'
import * as api from '@/api/archives'
import { polledJob } from './polledJob'

/** The archive of the club being made or made last on this page (directors). */
export const useClubArchiveStore = defineStore('clubArchive', () => {
  const { job, running, run, stopPolling } = polledJob<ClubArchiveJob>()

  /**
   * Starts an archive and polls it until it is done or failed, keeping `job` current for the
   * progress bar. Resolves with the finished job, or null when polling was stopped first. Lets
   * the ApiError through, of the start or of a poll.
   */
  const start = (clubId: string, options: { intervalMs?: number } = {}) =>
    run(
      () => api.startArchive(clubId),
      (id) => api.getArchive(clubId, id),
      options.intervalMs ?? 300,
    )

  return { job, running, start, stopPolling }
})
