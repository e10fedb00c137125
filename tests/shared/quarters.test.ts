import { describe, expect, it } from 'vitest'
import { previousQuarter, quarterEnd, quarterOf } from '../../shared/domain/quarters.ts'

// Calendar quarters: January–March, April–June, July–September, October–December (the
// Gregorian calendar; 2024 is a leap year, 2026 is not).
describe('calendar quarters', () => {
  it.each([
    ['2026-Q1', '2026-03-31'],
    ['2026-Q2', '2026-06-30'],
    ['2026-Q3', '2026-09-30'],
    ['2026-Q4', '2026-12-31'],
  ])('%s ends on %s', (quarter, end) => {
    expect(quarterEnd(quarter)).toBe(end)
  })

  it.each([
    ['2026-01-01', '2026-Q1'],
    ['2024-02-29', '2024-Q1'],
    ['2026-04-01', '2026-Q2'],
    ['2026-09-30', '2026-Q3'],
    ['2026-12-31', '2026-Q4'],
  ])('%s falls in %s', (date, quarter) => {
    expect(quarterOf(date)).toBe(quarter)
  })

  it.each([
    ['2026-Q1', '2025-Q4'],
    ['2026-Q2', '2026-Q1'],
    ['2026-Q4', '2026-Q3'],
  ])('the quarter before %s is %s', (quarter, before) => {
    expect(previousQuarter(quarter)).toBe(before)
  })

  it('refuses what is not a quarter', () => {
    expect(() => quarterEnd('2026-Q5')).toThrow('Not a quarter')
    expect(() => previousQuarter('2026-5')).toThrow('Not a quarter')
  })
})
