import type TestAgent from 'supertest/lib/agent.js'
import type { ReportPdfJob } from '../../shared/schemas/report-pdfs.ts'

/** Polls a PDF report until it is no longer being drawn; the answers seen on the way, in order. */
export async function settledPdf(agent: TestAgent, base: string, id: string) {
  const seen: ReportPdfJob[] = []
  for (;;) {
    const job = (await agent.get(`${base}/report-pdfs/${id}`).expect(200)).body as ReportPdfJob
    seen.push(job)
    if (job.status !== 'running') return { job, seen }
    await new Promise((r) => setTimeout(r, 25))
  }
}

/** The download of a drawn PDF report, its body as bytes. */
export const downloadPdf = (agent: TestAgent, base: string, id: string) =>
  agent
    .get(`${base}/report-pdfs/${id}/download`)
    .buffer(true)
    .parse((res, cb) => {
      const chunks: Buffer[] = []
      res.on('data', (c: Buffer) => chunks.push(c))
      res.on('end', () => cb(null, Buffer.concat(chunks)))
    })

/** Asks for the PDF report of an audit, waits for it and downloads it. */
export async function drawnPdf(agent: TestAgent, base: string, auditId: string) {
  const asked = await agent.post(`${base}/audits/${auditId}/report-pdfs`).expect(202)
  const { job } = await settledPdf(agent, base, asked.body.id)
  if (job.status !== 'done') throw new Error(`the PDF report ${job.status}: ${job.error}`)
  return (await downloadPdf(agent, base, job.id).expect(200)).body as Buffer
}
