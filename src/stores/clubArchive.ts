import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import type { ClubArchiveJob } from '@shared/schemas/archives'
import * as api from '@/api/archives'

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms))

/** The archive of the club being made or made last on this page (directors). */
export const useClubArchiveStore = defineStore('clubArchive', () => {
  const job = ref<ClubArchiveJob | null>(null)
  const running = computed(() => job.value?.status === 'running')
  // Each start takes a new ticket; a poll loop whose ticket is no longer current stops, so
  // leaving the page (or starting again) never leaves a loop polling in the background.
  let ticket = 0

  /**
   * Starts an archive and polls it until it is done or failed, keeping `job` current for the
   * progress bar. Resolves with the finished job, or null when polling was stopped first. Lets
   * the ApiError through, of the start or of a poll.
   */
  async function start(clubId: string, options: { intervalMs?: number } = {}) {
    const mine = ++ticket
    const intervalMs = options.intervalMs ?? 300
    job.value = null
    let current = await api.startArchive(clubId)
    if (mine !== ticket) return null
    job.value = current
    while (current.status === 'running') {
      await sleep(intervalMs)
      if (mine !== ticket) return null
      current = await api.getArchive(clubId, current.id)
      if (mine !== ticket) return null
      job.value = current
    }
    return current
  }

  /** Stops polling and forgets the archive; the server carries on making it all the same. */
  function stopPolling() {
    ticket++
    job.value = null
  }

  return { job, running, start, stopPolling }
})
