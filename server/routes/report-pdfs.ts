import { z } from 'zod'
import type { AppContext } from '../context.ts'
import { AppError } from '../http/errors.ts'
import { getReportPdf, reportPdfDownload, submitReportPdf } from '../services/report-pdfs.ts'
import type { ClubRoute } from './club-routes.ts'

const readers = ['director', 'coach', 'clinician'] as const

// A malformed id names nothing: it gets the 404 of any unknown one, not a 400.
const uuidOr404 = (raw: unknown, message: string) => {
  const id = z.uuid().safeParse(raw)
  if (!id.success) throw new AppError(404, 'not_found', message)
  return id.data
}
const pdfId = (raw: unknown) => uuidOr404(raw, 'No such PDF report.')

/** An audit's PDF report: drawn by a worker for the person who asks, polled, then downloaded. */
export function reportPdfRoutes(ctx: AppContext): ClubRoute[] {
  return [
    {
      method: 'post',
      path: '/audits/:id/report-pdfs',
      allow: readers,
      handler: async (req, res) => {
        const auditId = uuidOr404(req.params.id, 'No such audit.')
        res.status(202).json(await submitReportPdf(ctx.db, ctx.jobs, req.club, auditId))
      },
    },
    {
      method: 'get',
      path: '/report-pdfs/:id',
      allow: readers,
      handler: async (req, res) =>
        res.json(await getReportPdf(ctx.db, ctx.jobs, req.club, pdfId(req.params.id))),
    },
    {
      method: 'get',
      path: '/report-pdfs/:id/download',
      allow: readers,
      handler: async (req, res) => {
        const { filename, bytes } = await reportPdfDownload(ctx.db, req.club, pdfId(req.params.id))
        res.setHeader('Content-Type', 'application/pdf')
        res.setHeader('Content-Disposition', `attachment; filename="${filename}"`)
        res.send(bytes)
      },
    },
  ]
}
