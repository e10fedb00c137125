import { describe, expect, it } from 'vitest'
import { exportFileName, headlineCells } from '../../server/services/audit-exports.ts'

// Rounding of exported headline figures: shares as percentages with one decimal, ratios with two,
// as the report shows them. Common practice (no published source); each case worked by hand.
describe('headline figures in the CSV', () => {
  it.each([
    // 0.12345 × 100 = 12.345 → 12.3 %; change 0.0201 × 100 = 2.01 → 2.0 points
    ['percent', 0.12345, 0.0201, [12.3, '%', 2, 'pts']],
    // 2/3 × 100 = 66.666… → 66.7 %; a fall of 1/3 → −33.3 points
    ['percent', 2 / 3, -1 / 3, [66.7, '%', -33.3, 'pts']],
    // 1.234 → 1.23; change −0.005 rounds half away from zero to −0.01
    ['ratio', 1.234, -0.005, [1.23, 'ratio', -0.01, 'ratio']],
    // counts stay whole, without a unit
    ['count', 17, 3, [17, '', 3, '']],
  ] as const)('writes a %s figure rounded with its unit', (unit, value, change, cells) => {
    expect(headlineCells(unit, value, change)).toEqual(cells)
  })

  it('writes no data as an empty value, never as 0', () => {
    expect(headlineCells('percent', null, null)).toEqual([null, '%', null, ''])
  })
})

describe('export file names', () => {
  it.each([
    ['gaps', 'Falcons', '2026-09-30', 'csv', 'gaps-falcons-2026-09-30.csv'],
    ['headline', 'Étoile Juniors', '2026-06-30', 'csv', 'headline-etoile-juniors-2026-06-30.csv'],
    ['gaps', '***', '2026-03-31', 'csv', 'gaps-audit-2026-03-31.csv'],
  ])('names a %s export after its scope %s and date', (kind, scope, asOf, ext, name) => {
    expect(exportFileName(kind, scope, asOf, ext)).toBe(name)
  })
})
