import { flushPromises } from '@vue/test-utils'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import * as api from '@/api/clips'
import { ApiError } from '@/api/http'
import ClipsPanel from '@/components/clips/ClipsPanel.vue'
import ClipsUpload from '@/components/clips/ClipsUpload.vue'
import { mountInProviders } from './catalogue-helpers'

vi.mock('@/api/clips', () => ({
  listClips: vi.fn(),
  uploadClip: vi.fn(),
  markClipReviewed: vi.fn(),
  clipVideoUrl: (clubId: string, clipId: string) => `/api/clubs/${clubId}/clips/${clipId}/video`,
}))
vi.mock('@/api/visits', () => ({ createRecommendation: vi.fn(), listRecommendations: vi.fn() }))

const clubId = '11111111-1111-4111-8111-111111111111'
const athleteId = '33333333-3333-4333-8333-333333333333'
const elementId = '44444444-4444-4444-8444-444444444444'
const text = () => document.body.textContent ?? ''
const clip = {
  id: '55555555-5555-4555-8555-555555555555',
  athleteId,
  athleteName: 'Ada Example',
  squadId: '22222222-2222-4222-8222-222222222222',
  squadName: 'Squad A',
  elementId,
  elementName: 'Front tuck',
  contentType: 'video/webm',
  sizeBytes: 4869,
  fileName: 'attempt.webm',
  note: '',
  uploadedByName: 'Coach',
  createdAt: '2030-01-01T10:00:00.000Z',
  reviewedByMe: false,
}

function pick(file: File) {
  const input = document.querySelector<HTMLInputElement>('[data-test="clip-file"]')!
  Object.defineProperty(input, 'files', { value: [file], configurable: true })
  input.dispatchEvent(new Event('change'))
}

beforeEach(() => vi.mocked(api.listClips).mockResolvedValue([]))
afterEach(() => {
  document.body.innerHTML = ''
  vi.clearAllMocks()
})

describe('ClipsUpload', () => {
  it('shows the progress, then the server’s refusal, and uploads the same file on retry', async () => {
    let report: (fraction: number) => void = () => {}
    let fail: (err: unknown) => void = () => {}
    vi.mocked(api.uploadClip).mockImplementationOnce(
      (_club, _input, onProgress) =>
        new Promise((_resolve, reject) => {
          report = onProgress!
          fail = reject
        }),
    )
    mountInProviders(ClipsUpload, { clubId, athleteId, elementId })
    const file = new File([new Uint8Array([0x1a, 0x45, 0xdf, 0xa3])], 'attempt.webm', {
      type: 'video/webm',
    })
    pick(file)
    await flushPromises()
    report(0.42)
    await flushPromises()
    expect(document.querySelector('[data-test="clip-progress"]')?.textContent).toContain('42')
    fail(new ApiError(0, 'network', 'The upload was interrupted. Check the connection and retry.'))
    await flushPromises()
    expect(text()).toContain('The upload was interrupted')
    vi.mocked(api.uploadClip).mockResolvedValueOnce(clip)
    const retry = [...document.querySelectorAll('button')].find((b) =>
      b.textContent?.includes('Retry'),
    )!
    retry.click()
    await flushPromises()
    expect(api.uploadClip).toHaveBeenCalledTimes(2)
    expect(vi.mocked(api.uploadClip).mock.calls[1]![1]).toMatchObject({
      athleteId,
      elementId,
      file,
    })
    expect(document.querySelector('[data-test="clip-error"]')).toBeNull()
  })
})

describe('ClipsPanel', () => {
  it('plays a clip from the server’s address and lets a clinician mark it reviewed', async () => {
    vi.mocked(api.listClips).mockResolvedValue([clip])
    vi.mocked(api.markClipReviewed).mockResolvedValue({ ...clip, reviewedByMe: true })
    mountInProviders(ClipsPanel, { clubId, filter: { unreviewed: true }, reviewing: true })
    await flushPromises()
    expect(text()).toContain('Ada Example · Front tuck')
    const button = (label: string) =>
      [...document.querySelectorAll('button')].find((b) => b.textContent?.includes(label))!
    button('Watch').click()
    await flushPromises()
    const video = document.querySelector<HTMLVideoElement>('[data-test="clip-player"]')!
    expect(video.getAttribute('src')).toBe(`/api/clubs/${clubId}/clips/${clip.id}/video`)
    button('Mark reviewed').click()
    await flushPromises()
    expect(api.markClipReviewed).toHaveBeenCalledWith(clubId, clip.id)
  })

  it('says so when there are no clips', async () => {
    mountInProviders(ClipsPanel, { clubId, filter: { athleteId }, emptyText: 'No clips yet.' })
    await flushPromises()
    expect(text()).toContain('No clips yet.')
  })
})
