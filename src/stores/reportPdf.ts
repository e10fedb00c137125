import { defineStore } from 'pinia'
import type { ReportPdfJob } from '@shared/schemas/report-pdfs'
import * as api from '@/api/audits'
import { polledJob } from './polledJob'

/** The PDF report of the audit on screen, being drawn or drawn last. */
export const useReportPdfStore = defineStore('reportPdf', () => {
  const { job, running, run, stopPolling } = polledJob<ReportPdfJob>()

  /**
   * Asks for the audit's PDF report and polls it until it is drawn or failed, keeping `job`
   * current for the progress shown. Resolves with the finished job, or null when polling was
   * stopped first. Lets the ApiError through, of the ask or of a poll.
   */
  const start = (clubId: string, auditId: string, options: { intervalMs?: number } = {}) =>
    run(
      () => api.startReportPdf(clubId, auditId),
      (id) => api.getReportPdf(clubId, id),
      options.intervalMs ?? 500,
    )

  return { job, running, start, stopPolling }
})
