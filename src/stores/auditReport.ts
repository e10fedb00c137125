import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import type { GapEntry } from '@shared/domain/audit/types'
import { erasedAthleteLabel } from '@shared/domain/erasure'
import type { AuditReport } from '@shared/schemas/audits'
import * as api from '@/api/audits'
import type { AuditRecheck } from '@/api/audits'
import { ApiError } from '@/api/http'

/** A gap with its rank in the whole list, so that filtering by squad keeps the ranks. */
export interface RankedGap extends GapEntry {
  rank: number
}

/** One audit's report, its re-check and its publication. */
export const useAuditReportStore = defineStore('auditReport', () => {
  const report = ref<AuditReport | null>(null)
  const loading = ref(false)
  const error = ref<string | null>(null)
  /** The audit was not found (or belongs to another club): a page of its own, not a retry. */
  const missing = ref(false)
  const recheckResult = ref<AuditRecheck | null>(null)
  const rechecking = ref(false)
  const publishing = ref(false)

  const rankedGaps = computed<RankedGap[]>(() =>
    (report.value?.result.gaps ?? []).map((gap, i) => ({ ...gap, rank: i + 1 })),
  )

  // The server names every athlete a report lists; one erased for good comes under this label.
  const athleteName = (id: string) => report.value?.athleteNames[id] ?? erasedAthleteLabel
  const squadName = (id: string) => report.value?.squadNames[id] ?? 'Squad'

  /** Loads the report; the error is kept for the view to show. */
  async function load(clubId: string, id: string) {
    loading.value = true
    error.value = null
    missing.value = false
    recheckResult.value = null
    if (report.value?.audit.id !== id) report.value = null
    try {
      report.value = await api.getAuditReport(clubId, id)
    } catch (err) {
      missing.value = err instanceof ApiError && err.status === 404
      error.value = err instanceof Error ? err.message : String(err)
    } finally {
      loading.value = false
    }
  }

  /** Gathers the inputs again as of the audit's date and compares their hash (directors). */
  async function recheck(clubId: string) {
    if (!report.value) return null
    rechecking.value = true
    try {
      recheckResult.value = await api.recheckAudit(clubId, report.value.audit.id)
      return recheckResult.value
    } finally {
      rechecking.value = false
    }
  }

  /**
   * Publishes the audit to the board (directors) and resolves with how many board members were
   * e-mailed and whether it had been published already (nobody is e-mailed twice).
   */
  async function publish(clubId: string) {
    if (!report.value) return { notified: 0, alreadyPublished: false }
    publishing.value = true
    try {
      const { notified, alreadyPublished, ...audit } = await api.publishAudit(
        clubId,
        report.value.audit.id,
      )
      report.value = { ...report.value, audit }
      return { notified, alreadyPublished }
    } finally {
      publishing.value = false
    }
  }

  return {
    report,
    loading,
    error,
    missing,
    recheckResult,
    rechecking,
    publishing,
    rankedGaps,
    athleteName,
    squadName,
    load,
    recheck,
    publish,
  }
})
