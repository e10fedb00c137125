import { flushPromises } from '@vue/test-utils'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { safetyCaution } from '@shared/domain/element'
import * as api from '@/api/audits'
import AuditReportView from '@/views/AuditReportView.vue'
import { athleteNames, auditId, auditReport, mountInProviders, wait } from './audit-helpers'

vi.mock('vue-chartjs', async () => {
  const { ChartStub } = await import('./audit-chart-stub')
  return { Bar: ChartStub, Line: ChartStub }
})
vi.mock('@/api/audits', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/audits')>()),
  getAuditReport: vi.fn(),
  recheckAudit: vi.fn(),
  publishAudit: vi.fn(),
}))

const byTest = (name: string) => document.querySelector<HTMLElement>(`[data-test="${name}"]`)

async function settle() {
  await flushPromises()
  await wait(5)
  await flushPromises()
}

beforeEach(() => {
  vi.mocked(api.getAuditReport).mockReset()
  vi.mocked(api.recheckAudit).mockReset()
})
afterEach(() => {
  document.body.innerHTML = ''
})

describe('AuditReportView', () => {
  it('shows each headline figure with its change since the previous audit, in words too', async () => {
    vi.mocked(api.getAuditReport).mockResolvedValue(auditReport())
    mountInProviders(AuditReportView, { id: auditId })
    await settle()

    const frontLag = byTest('figure-front-lag')!.textContent!
    expect(frontLag).toContain('32.5%')
    expect(frontLag).toContain('▲ +2.5 pts')
    expect(frontLag).toContain('worse')
    expect(frontLag).toContain('up 2.5 pts since the previous audit (worse)')

    const ratio = byTest('figure-balance-ratio')!.textContent!
    expect(ratio).toContain('0.85')
    expect(ratio).toContain('▲ +0.05')
    expect(ratio).toContain('better')

    const catalogueGaps = byTest('figure-catalogue-gaps')!.textContent!
    expect(catalogueGaps).toContain('3')
    expect(catalogueGaps).toContain('▼ −2')
    expect(catalogueGaps).toContain('better')

    expect(byTest('figure-back-lag')!.textContent).toContain('unchanged')
    expect(byTest('figure-readiness-alerts')!.textContent).toContain('▲ +1')
    expect(byTest('figure-athletes-with-gaps')).not.toBeNull()
    expect(document.body.textContent).toContain('2025-03-31')
  })

  it('says so when there is no previous audit of the scope', async () => {
    const report = auditReport({ previous: null })
    for (const figure of Object.values(report.comparison)) {
      if ('change' in figure) Object.assign(figure, { previous: null, change: null })
    }
    vi.mocked(api.getAuditReport).mockResolvedValue(report)
    mountInProviders(AuditReportView, { id: auditId })
    await settle()
    expect(byTest('figure-front-lag')!.textContent).toContain('no previous audit of this scope')
    expect(document.body.textContent).toContain('This is the first audit of this scope')
  })

  it('ranks the gaps with names and steps, beside the safety caution, and shows the inputs hash', async () => {
    vi.mocked(api.getAuditReport).mockResolvedValue(auditReport())
    mountInProviders(AuditReportView, { id: auditId })
    await settle()
    const text = document.body.textContent!
    expect(text).toContain(safetyCaution)
    expect(text).toContain(athleteNames[0])
    // Each step out of its progression's length: index 5 of 8 steps is "step 6 of 8".
    expect(text).toContain('Back tuck · step 6 of 8')
    expect(text).toContain('Front tuck · step 3 of 6')
    // the rank follows the weighted deficit, shown with its parts (a single weighs 1)
    expect(text).toContain('3 × 1 = 3')
    expect(text).toContain('forecast 2025-08-30')
    expect(text).toContain('on time')
    expect(byTest('input-hash')!.textContent).toBe(auditReport().audit.inputHash)
    expect(byTest('limited')).toBeNull()
  })

  it('tells a coach the athlete rows are limited to their squads, and offers no director actions', async () => {
    vi.mocked(api.getAuditReport).mockResolvedValue(auditReport({ limitedToSquads: true }))
    mountInProviders(AuditReportView, { id: auditId }, { role: 'coach' })
    await settle()
    expect(byTest('limited')!.textContent).toContain('limited to the squads assigned to you')
    expect(byTest('recheck')).toBeNull()
    expect(byTest('publish')).toBeNull()
  })

  it('reports a recheck whose history has changed since the audit', async () => {
    vi.mocked(api.getAuditReport).mockResolvedValue(auditReport())
    vi.mocked(api.recheckAudit).mockResolvedValue({
      inputHash: 'a3f1',
      currentHash: 'ffee0011223344',
      unchanged: false,
    })
    mountInProviders(AuditReportView, { id: auditId })
    await settle()
    byTest('recheck')!.click()
    await settle()
    expect(api.recheckAudit).toHaveBeenCalledWith(expect.any(String), auditId)
    const result = byTest('recheck-result')!.textContent!
    expect(result).toContain('The history has changed since')
    expect(result).toContain('Run a new audit')
  })

  it('shows a scope without records as no data, squads without records apart, and a re-run', async () => {
    const base = auditReport()
    const [first, second] = base.result.squads
    vi.mocked(api.getAuditReport).mockResolvedValue({
      ...base,
      audit: { ...base.audit, rerun: true, clubFrontLag: null },
      result: {
        ...base.result,
        headline: { ...base.result.headline, clubFrontLag: null, squadsWithoutRecords: 1 },
        squads: [
          first!,
          { ...second!, athletesWithRecords: 0, frontLag: null, backLag: null, balanceRatio: null },
        ],
      },
    })
    mountInProviders(AuditReportView, { id: auditId })
    await settle()
    // no data, never 0.0%
    expect(byTest('figure-front-lag')!.textContent).toContain('no data')
    expect(byTest('figure-front-lag')!.textContent).not.toContain('0.0%')
    expect(byTest('rerun')!.textContent).toContain('re-run of 2025-06-30')
    // the squad table ranks the squad with records only; the other is counted apart
    const squadTable = document.querySelector('.n-data-table')!.textContent!
    expect(squadTable).toContain('Juniors A')
    expect(squadTable).not.toContain('Development')
    expect(byTest('squads-without-records')!.textContent).toContain(
      '1 squad without records (no data, not ranked): Development.',
    )
  })

  it('keeps catalogue gaps out of the athletes’ gap list, in their own section, shown there on demand', async () => {
    // The back double tuck has no forward element in the catalogue: however large its weighted
    // deficit (8 against the back tuck's 3), it is the director's to fix, not the coach's.
    const report = auditReport()
    report.result.catalogueGaps = [
      {
        elementId: 'e-back-double',
        elementName: 'Back double tuck',
        counterpartId: null,
        athleteCount: 1,
      },
    ]
    vi.mocked(api.getAuditReport).mockResolvedValue(report)
    mountInProviders(AuditReportView, { id: auditId })
    await settle()
    const cardTitles = [...document.querySelectorAll('h2')].map((h) => h.textContent)
    expect(cardTitles).toContain('Gaps (1)')
    expect(cardTitles).toContain('Catalogue gaps (1)')
    expect(document.body.textContent).not.toContain('Back double tuck · step 4 of 6')
    expect(byTest('catalogue-gaps')!.textContent).toContain(
      'Back double tuck · no forward element · 1 athlete working it',
    )

    byTest('gap-catalogue-filter')!.querySelector<HTMLElement>('.n-checkbox-box')!.click()
    await settle()
    expect(document.body.textContent).toContain('Back double tuck · step 4 of 6')
    expect(document.body.textContent).toContain('not in the catalogue')
  })
})
