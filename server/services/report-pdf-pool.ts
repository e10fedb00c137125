import { extname } from 'node:path'
import { fileURLToPath } from 'node:url'
import { Piscina } from 'piscina'
import type { AuditReport } from '../../shared/schemas/audits.ts'
import { reportPdfInput } from './report-pdf.ts'

// The worker is TypeScript where the server runs from its sources (tsx, vitest) and JavaScript
// once compiled; a TypeScript worker loads tsx itself.
const ownExtension = extname(fileURLToPath(import.meta.url))
const workerUrl = new URL(`./report-pdf.worker${ownExtension}`, import.meta.url)
const execArgv = ownExtension === '.ts' ? ['--import', import.meta.resolve('tsx')] : []

let pool: Piscina | undefined

/**
 * Drawing a PDF report takes a few hundred milliseconds of CPU (fonts are parsed and subset for
 * each document). It runs on one worker thread of this process, so the request loop keeps
 * answering meanwhile; the thread ends after a minute without work.
 */
export async function drawReportPdf(report: AuditReport, clubName: string): Promise<Buffer> {
  pool ??= new Piscina({
    filename: workerUrl.href,
    minThreads: 0,
    maxThreads: 1,
    idleTimeout: 60_000,
    execArgv,
  })
  const bytes: Uint8Array = await pool.run(reportPdfInput(report, clubName))
  return Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength)
}

/** Ends the drawing thread, if any, at shutdown. */
export async function closeReportPdfPool() {
  const closing = pool
  pool = undefined
  await closing?.close()
}
