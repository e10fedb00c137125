import { flushPromises } from '@vue/test-utils'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import type { ReportPdfJob } from '@shared/schemas/report-pdfs'
import * as api from '@/api/audits'
import { ApiError } from '@/api/http'
import AuditReportPdfButton from '@/components/audit/AuditReportPdfButton.vue'
import { saveFile } from '@/composables/saveFile'
import { auditId, clubId, mountInProviders, wait } from './audit-helpers'

vi.mock('@/api/audits', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/audits')>()),
  startReportPdf: vi.fn(),
  getReportPdf: vi.fn(),
}))
// The browser's save is not happy-dom's to do: what matters is what it is asked to save.
vi.mock('@/composables/saveFile', () => ({ saveFile: vi.fn() }))

const pdfId = '77777777-7777-4777-8777-777777777701'
const job = (partial: Partial<ReportPdfJob>): ReportPdfJob => ({
  id: pdfId,
  auditId,
  status: 'running',
  phase: 'queued',
  done: 0,
  total: 2,
  error: null,
  createdAt: '2026-05-04T10:00:00.000Z',
  expiresAt: '2026-05-04T11:00:00.000Z',
  bytes: null,
  ...partial,
})

const byTest = (name: string) => document.querySelector<HTMLElement>(`[data-test="${name}"]`)
async function settle() {
  await flushPromises()
  await wait(10)
  await flushPromises()
}
const mountButton = () =>
  mountInProviders(AuditReportPdfButton, {
    clubId,
    auditId,
    asOf: '2026-03-31',
    pollIntervalMs: 1,
  })

beforeEach(() => {
  vi.mocked(api.startReportPdf).mockReset()
  vi.mocked(api.getReportPdf).mockReset()
  vi.mocked(saveFile).mockReset()
})
afterEach(() => {
  document.body.innerHTML = ''
})

describe('AuditReportPdfButton', () => {
  it('is a button that asks for nothing until it is pressed', () => {
    mountButton()
    const start = byTest('pdf-start') as HTMLButtonElement
    expect(start.tagName).toBe('BUTTON')
    expect(start.textContent).toContain('PDF report')
    expect(api.startReportPdf).not.toHaveBeenCalled()
    expect(byTest('pdf-progress')).toBeNull()
  })

  it('shows the PDF being prepared, then saves it and offers it again', async () => {
    vi.mocked(api.startReportPdf).mockResolvedValue(job({}))
    let release: () => void = () => undefined
    const held = new Promise<void>((resolve) => (release = resolve))
    vi.mocked(api.getReportPdf)
      .mockResolvedValueOnce(job({ phase: 'drawing', done: 1 }))
      .mockImplementationOnce(async () => {
        await held
        return job({ status: 'done', phase: 'done', done: 2, bytes: 23_456 })
      })
    mountButton()
    byTest('pdf-start')!.click()
    await settle()
    const start = byTest('pdf-start') as HTMLButtonElement
    expect(start.textContent).toContain('Preparing PDF…')
    expect(start.disabled).toBe(true)
    const progress = byTest('pdf-progress')!
    expect(progress.textContent).toContain('Drawing the pages')
    expect(progress.closest('[aria-live="polite"]')).not.toBeNull()
    expect(saveFile).not.toHaveBeenCalled()

    release()
    await settle()
    expect(api.startReportPdf).toHaveBeenCalledWith(clubId, auditId)
    const url = `/api/clubs/${clubId}/report-pdfs/${pdfId}/download`
    expect(saveFile).toHaveBeenCalledExactlyOnceWith(url, 'audit-2026-03-31.pdf')
    expect(byTest('pdf-progress')).toBeNull()
    const link = byTest('pdf-download')!
    expect(link.tagName).toBe('A')
    expect(link.getAttribute('href')).toBe(url)
    expect(link.getAttribute('download')).toBe('audit-2026-03-31.pdf')
    expect(byTest('pdf-ready')!.textContent).toContain('(23 kB)')
    expect((byTest('pdf-start') as HTMLButtonElement).disabled).toBe(false)
  })

  it('says why a PDF failed, and tries again from the alert', async () => {
    vi.mocked(api.startReportPdf).mockResolvedValue(job({}))
    vi.mocked(api.getReportPdf).mockResolvedValueOnce(
      job({ status: 'failed', error: 'The PDF report could not be made. Try again.' }),
    )
    mountButton()
    byTest('pdf-start')!.click()
    await settle()
    expect(byTest('pdf-failure')!.textContent).toContain('could not be made. Try again.')
    expect(saveFile).not.toHaveBeenCalled()

    vi.mocked(api.getReportPdf).mockResolvedValueOnce(job({ status: 'done', phase: 'done' }))
    const retry = byTest('pdf-retry') as HTMLButtonElement
    expect(retry.tagName).toBe('BUTTON')
    retry.click()
    await settle()
    expect(api.startReportPdf).toHaveBeenCalledTimes(2)
    expect(byTest('pdf-failure')).toBeNull()
    expect(saveFile).toHaveBeenCalledTimes(1)
  })

  it('shows the server’s refusal', async () => {
    vi.mocked(api.startReportPdf).mockRejectedValue(
      new ApiError(404, 'not_found', 'No such audit.'),
    )
    mountButton()
    byTest('pdf-start')!.click()
    await settle()
    expect(byTest('pdf-failure')!.textContent).toContain('No such audit.')
  })
})
