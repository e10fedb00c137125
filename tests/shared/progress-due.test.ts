import { describe, expect, it } from 'vitest'
import { compareDue, isProgressDue } from '../../shared/domain/progress-due.ts'

// Worked by hand on a calendar: March 2026 has 31 days, so 2026-03-01 to 2026-03-29 is 28 days
// and 2026-02-27 to 2026-03-27 is 28 days across February's 28 days. A 28-day window is common
// practice (no published source): about four weekly sessions with nothing logged.
describe('isProgressDue', () => {
  it.each([
    [null, '2026-03-29', 28, true], // never logged
    ['2026-03-01', '2026-03-29', 28, true], // exactly 28 days
    ['2026-03-02', '2026-03-29', 28, false], // 27 days
    ['2026-02-27', '2026-03-27', 28, true], // 28 days across the end of February
    ['2026-02-28', '2026-03-27', 28, false], // 27 days
    ['2025-12-25', '2026-01-08', 14, true], // 14 days across the new year
    ['2026-03-29', '2026-03-29', 1, false], // logged today
  ] as const)('last log %s, today %s, %i days: due %s', (last, today, days, due) => {
    expect(isProgressDue(last, today, days)).toBe(due)
  })
})

describe('compareDue', () => {
  it('puts never-logged first, then the oldest log, then names in order', () => {
    const list = [
      { athleteName: 'Cora Vale', lastEventOn: '2026-02-01' },
      { athleteName: 'Bo Lind', lastEventOn: null },
      { athleteName: 'Al Moss', lastEventOn: '2026-01-15' },
      { athleteName: 'Ada Lind', lastEventOn: null },
      { athleteName: 'Ben Hale', lastEventOn: '2026-02-01' },
    ]
    expect([...list].sort(compareDue).map((a) => a.athleteName)).toEqual([
      'Ada Lind',
      'Bo Lind',
      'Al Moss',
      'Ben Hale',
      'Cora Vale',
    ])
  })
})
