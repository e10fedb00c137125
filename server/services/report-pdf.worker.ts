import { reportPdf, type ReportPdfInput } from './report-pdf.ts'

/** Draws one PDF report on a worker thread; the bytes go back without a copy. */
export default async function drawReportPdf(input: ReportPdfInput): Promise<Uint8Array> {
  const pdf = await reportPdf(input)
  return new Uint8Array(pdf.buffer, pdf.byteOffset, pdf.byteLength)
}
