import { describe, expect, it } from 'vitest'
import { reportPdf, reportPdfInput } from '../../server/services/report-pdf.ts'
import { compareAudits } from '../../shared/domain/audit/comparison.ts'
import { runAudit } from '../../shared/domain/audit/run.ts'
import type { AuditReport } from '../../shared/schemas/audits.ts'
import { readPdf } from '../e2e/support-files.ts'
import { inputs } from '../support/audit-example.ts'

// The worked example of tests/support/audit-example.ts: the athletes' gaps are dee BT, ana BT
// and dee BP; ana's BDT and dee's BWO have no forward element in the catalogue (FDT is missing,
// BWO has none), so they are the catalogue's, listed by element for the director.
const result = runAudit(inputs)
const report: AuditReport = {
  audit: {
    id: '00000000-0000-4000-8000-000000000001',
    squadId: null,
    scopeName: 'Whole club',
    asOf: inputs.asOf,
    inputHash: 'a'.repeat(64),
    createdAt: '2025-09-15T10:00:00.000Z',
    publishedAt: null,
    rerun: false,
    clubFrontLag: result.headline.clubFrontLag,
    balanceRatio: result.headline.balanceRatio,
    athleteCount: result.headline.athleteCount,
  },
  result,
  comparison: compareAudits(null, result),
  previous: null,
  trend: [],
  athleteNames: { ana: 'Ana Example', ben: 'Ben Example', cai: 'Cai Example', dee: 'Dee Example' },
  squadNames: { 'squad-a': 'Squad A', 'squad-b': 'Squad B' },
  limitedToSquads: false,
  visitOutcomes: null,
}

describe('the PDF report', () => {
  it('lists the athletes’ gaps only, and the catalogue gaps apart by element', async () => {
    const input = reportPdfInput(report, 'Test club')
    expect(input.gapTotal).toBe(3)
    const { text } = readPdf(await reportPdf(input))
    const largest = text.slice(text.indexOf('Largest gaps'), text.indexOf('Catalogue gaps ('))
    expect(largest).toContain('1. Dee Example: BT')
    expect(largest).toContain('3. Dee Example: BP')
    expect(largest).not.toContain('BDT')
    expect(largest).not.toContain('no forward element')
    expect(text).toContain('Catalogue gaps (2)')
    expect(text).toContain('BDT · 1 athlete working it')
    expect(text).toContain('BWO · 1 athlete working it')
  })
})
