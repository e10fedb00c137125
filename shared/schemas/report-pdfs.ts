import { z } from 'zod'
import { jobProgressSchema } from './jobs.ts'

/** What the drawing of an audit's PDF report is doing, in the order it does it. */
export const reportPdfPhases = ['queued', 'report', 'drawing', 'done'] as const
export type ReportPdfPhase = (typeof reportPdfPhases)[number]

/**
 * POST /audits/:id/report-pdfs and GET /report-pdfs/:id: a PDF report asked for and how far its
 * drawing has got. `expired` once its hour is over (the download then answers 410).
 */
export const reportPdfJobSchema = jobProgressSchema.extend({ auditId: z.uuid() })
export type ReportPdfJob = z.infer<typeof reportPdfJobSchema>
