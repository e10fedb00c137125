import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import type { AuditJob, AuditRun, AuditSummary } from '@shared/schemas/audits'
import * as api from '@/api/audits'
import type { AuditScopeSquad } from '@/api/audits'

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms))

/** The club's audits, the squads to scope a new one to, and the run in progress (directors). */
export const useAuditsStore = defineStore('audits', () => {
  const audits = ref<AuditSummary[]>([])
  const squads = ref<AuditScopeSquad[]>([])
  const loading = ref(false)
  const error = ref<string | null>(null)
  const job = ref<AuditJob | null>(null)
  const running = computed(() => job.value?.status === 'running')
  // Each run takes a new ticket; a poll loop whose ticket is no longer current stops, so leaving
  // the page (or starting again) never leaves a loop polling in the background.
  let ticket = 0

  /**
   * Loads the list; with `withSquads` (directors, for the run form) also the squads. The error
   * is kept for the view to show.
   */
  async function load(clubId: string, options: { withSquads?: boolean } = {}) {
    loading.value = true
    error.value = null
    try {
      const [list, squadList] = await Promise.all([
        api.listAudits(clubId),
        options.withSquads ? api.listAuditSquads(clubId) : Promise.resolve(squads.value),
      ])
      audits.value = list
      squads.value = [...squadList].sort((a, b) => a.name.localeCompare(b.name))
    } catch (err) {
      error.value = err instanceof Error ? err.message : String(err)
    } finally {
      loading.value = false
    }
  }

  /**
   * Starts an audit and polls its job until it is done or failed, keeping `job` current for the
   * progress bar. Resolves with the finished job, or null when polling was stopped first. Lets
   * the ApiError of the start through (a future date is a 400 with the field named).
   */
  async function run(
    clubId: string,
    input: AuditRun,
    options: { intervalMs?: number } = {},
  ): Promise<AuditJob | null> {
    const mine = ++ticket
    const intervalMs = options.intervalMs ?? 200
    job.value = null
    let current = await api.startAudit(clubId, input)
    job.value = current
    while (current.status === 'running') {
      await sleep(intervalMs)
      if (mine !== ticket) return null
      current = await api.getAuditJob(clubId, current.id)
      if (mine !== ticket) return null
      job.value = current
    }
    if (current.status === 'done') {
      // The list is refreshed for when the director comes back to it; a failure here does not
      // undo the audit, which is stored.
      void api.listAudits(clubId).then(
        (list) => (audits.value = list),
        () => undefined,
      )
    }
    return current
  }

  /** Stops polling; the server carries on with the run and stores the audit all the same. */
  function stopPolling() {
    ticket++
    job.value = null
  }

  return { audits, squads, loading, error, job, running, load, run, stopPolling }
})
