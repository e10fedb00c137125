import { flushPromises } from '@vue/test-utils'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import * as api from '@/api/audits'
import BoardSummaryView from '@/views/BoardSummaryView.vue'
import { athleteNames, auditReport, boardSummary, mountInProviders, wait } from './audit-helpers'
import { savedImageTitles } from './audit-chart-stub'

vi.mock('vue-chartjs', async () => {
  const { ChartStub } = await import('./audit-chart-stub')
  return { Bar: ChartStub, Line: ChartStub }
})
vi.mock('@/api/audits', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/audits')>()),
  getBoardSummary: vi.fn(),
  getAuditReport: vi.fn(),
}))

const byTest = (name: string) => document.querySelector<HTMLElement>(`[data-test="${name}"]`)

async function settle() {
  await flushPromises()
  await wait(5)
  await flushPromises()
}

beforeEach(() => {
  vi.mocked(api.getBoardSummary).mockReset()
  vi.mocked(api.getAuditReport).mockReset().mockResolvedValue(auditReport())
})
afterEach(() => {
  document.body.innerHTML = ''
  vi.restoreAllMocks()
})

describe('BoardSummaryView', () => {
  it('shows the trend, the latest figures and the squads, and no athlete anywhere', async () => {
    vi.mocked(api.getBoardSummary).mockResolvedValue(boardSummary())
    mountInProviders(BoardSummaryView, {}, { role: 'board' })
    await settle()

    const text = document.body.textContent!
    expect(text).toContain('Demo club')
    expect(byTest('figure-front-lag')!.textContent).toContain('25.0%')
    expect(byTest('figure-front-lag')!.textContent).toContain('▼ −5.0 pts')
    expect(byTest('figure-front-lag')!.textContent).toContain('better')
    expect(byTest('figure-balance-ratio')!.textContent).toContain('0.90')
    expect(byTest('figure-athletes-with-gaps')!.textContent).toContain('7')
    expect(text).toContain('Juniors A')
    expect(text).toContain('31.0%')
    // The trend chart is drawn across the published audits' dates.
    expect(text).toContain('2025-03-31 | 2025-06-30')

    for (const name of athleteNames) expect(text).not.toContain(name)
    expect(api.getAuditReport).not.toHaveBeenCalled()
  })

  it('says no audit has been published yet', async () => {
    vi.mocked(api.getBoardSummary).mockResolvedValue(boardSummary({ trend: [], latest: null }))
    mountInProviders(BoardSummaryView, {}, { role: 'board' })
    await settle()
    expect(document.body.textContent).toContain('No audit has been published yet')
    expect(byTest('download-chart')).toBeNull()
  })

  it('downloads the trend chart as a PNG', async () => {
    vi.mocked(api.getBoardSummary).mockResolvedValue(boardSummary())
    const clicked: HTMLAnchorElement[] = []
    vi.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(function (
      this: HTMLAnchorElement,
    ) {
      clicked.push(this)
    })
    mountInProviders(BoardSummaryView, {}, { role: 'director' })
    await settle()
    byTest('download-chart')!.click()
    expect(clicked).toHaveLength(1)
    expect(clicked[0]!.href).toContain('data:image/png')
    expect(clicked[0]!.download).toBe('Demo-club-balance-2025-06-30.png')
    // The image carries a title, the club's name and the audit date.
    expect(savedImageTitles.at(-1)).toMatchObject({
      display: true,
      text: ['Forward/backward balance over time', 'Demo club · audit as of 2025-06-30'],
    })
  })

  it('shows the change the server computed, and counts squads without records apart', async () => {
    const summary = boardSummary()
    vi.mocked(api.getBoardSummary).mockResolvedValue({
      ...summary,
      latest: {
        ...summary.latest!,
        // the server measures from the last published audit of an earlier date, which need
        // not be the trend's previous point as the client would have guessed (0.30 → 0.25)
        comparison: {
          ...summary.latest!.comparison,
          clubFrontLag: { previous: 0.2, current: 0.25, change: 0.05 },
        },
        squadsWithoutRecords: 2,
      },
    })
    mountInProviders(BoardSummaryView, {}, { role: 'board' })
    await settle()
    expect(byTest('figure-front-lag')!.textContent).toContain('▲ +5.0 pts')
    expect(byTest('squads-without-records')!.textContent).toContain('2 squads without records')
    // two bars, for the squads with records
    expect(document.body.textContent).toContain('Development | Juniors A')
  })
})
