import { flushPromises } from '@vue/test-utils'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import type { ClubArchiveJob } from '@shared/schemas/archives'
import * as api from '@/api/archives'
import { ApiError } from '@/api/http'
import ClubArchiveCard from '@/components/club/ClubArchiveCard.vue'
import { fileSize } from '@/components/club/clubArchiveFormat'
import { clubId, mountInProviders, wait } from './audit-helpers'

vi.mock('@/api/archives', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/archives')>()),
  startArchive: vi.fn(),
  getArchive: vi.fn(),
}))

const archiveId = '99999999-9999-4999-8999-999999999901'
const job = (partial: Partial<ClubArchiveJob>): ClubArchiveJob => ({
  id: archiveId,
  status: 'running',
  phase: 'queued',
  done: 0,
  total: 1,
  error: null,
  createdAt: '2026-05-04T10:00:00.000Z',
  expiresAt: '2026-05-05T10:00:05.000Z',
  bytes: null,
  sha256: null,
  ...partial,
})

const byTest = (name: string) => document.querySelector<HTMLElement>(`[data-test="${name}"]`)
async function settle() {
  await flushPromises()
  await wait(10)
  await flushPromises()
}
const mountCard = () => mountInProviders(ClubArchiveCard, { clubId, pollIntervalMs: 1 })

beforeEach(() => {
  vi.mocked(api.startArchive).mockReset()
  vi.mocked(api.getArchive).mockReset()
})
afterEach(() => {
  document.body.innerHTML = ''
})

describe('ClubArchiveCard', () => {
  it('says what the archive holds and that it is personal data of minors, before anything is made', () => {
    mountCard()
    const card = byTest('club-archive')!
    expect(card.textContent).toContain('Take the data away')
    expect(card.textContent).toContain('the full progress history with every correction')
    expect(card.textContent).toContain('manifest.json')
    expect(byTest('archive-privacy')!.textContent).toContain('most of them children')
    expect(byTest('archive-empty')).not.toBeNull()
    expect(byTest('archive-download')).toBeNull()
  })

  it('shows the build progressing, then a link to download the zip', async () => {
    vi.mocked(api.startArchive).mockResolvedValue(job({}))
    let release: () => void = () => undefined
    const held = new Promise<void>((resolve) => (release = resolve))
    vi.mocked(api.getArchive)
      .mockResolvedValueOnce(job({ phase: 'progress', done: 6, total: 24 }))
      .mockImplementationOnce(async () => {
        await held
        return job({ status: 'done', phase: 'done', done: 24, total: 24, bytes: 2_345_678 })
      })
    mountCard()
    const start = byTest('archive-start') as HTMLButtonElement
    expect(start.tagName).toBe('BUTTON')
    start.click()
    await settle()
    const progress = byTest('archive-progress')!
    expect(progress.textContent).toContain('Progress history and records · 6 of 24')
    expect(progress.querySelector('[role="progressbar"], .n-progress')).not.toBeNull()
    expect(byTest('archive-empty')).toBeNull()

    release()
    await settle()
    expect(api.startArchive).toHaveBeenCalledWith(clubId)
    expect(byTest('archive-progress')).toBeNull()
    const link = byTest('archive-download')!
    expect(link.tagName).toBe('A')
    expect(link.getAttribute('href')).toBe(`/api/clubs/${clubId}/archives/${archiveId}/download`)
    expect(link.hasAttribute('download')).toBe(true)
    expect(link.textContent).toContain('(2.3 MB)')
    expect(byTest('archive-ready')!.textContent).toContain('The link works until')
    expect(byTest('archive-start')!.textContent).toContain('Make a new archive')
  })

  it('shows why an archive failed, and lets the director try again', async () => {
    vi.mocked(api.startArchive).mockResolvedValue(job({}))
    vi.mocked(api.getArchive).mockResolvedValue(
      job({ status: 'failed', error: 'The archive could not be made. Try again.' }),
    )
    mountCard()
    byTest('archive-start')!.click()
    await settle()
    expect(byTest('archive-failure')!.textContent).toContain('Try again.')
    expect(byTest('archive-download')).toBeNull()
    expect((byTest('archive-start') as HTMLButtonElement).disabled).toBe(false)
  })

  it('shows the server’s refusal', async () => {
    vi.mocked(api.startArchive).mockRejectedValue(
      new ApiError(403, 'forbidden', 'You do not have access to this.'),
    )
    mountCard()
    byTest('archive-start')!.click()
    await settle()
    expect(byTest('archive-failure')!.textContent).toContain('You do not have access to this.')
  })
})

describe('fileSize', () => {
  it.each([
    [812, '812 bytes'],
    [14_200, '14 kB'],
    [3_240_000, '3.2 MB'],
  ])('%d bytes read as %s', (bytes, words) => {
    expect(fileSize(bytes)).toBe(words)
  })
})
