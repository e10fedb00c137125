import { describe, expect, it } from 'vitest'
import { addDaysIso, canMoveTo, reminderDay, visitPhase } from '../../shared/domain/visits.ts'

// Dates worked by hand on a calendar; the rules are the product brief's ("access limited to the
// window", "coaches accept, decline or complete them") and common practice (no published
// source) for a reminder a few days before a due date.

describe('visitPhase', () => {
  const visit = { firstDay: '2027-03-03', lastDay: '2027-03-05' }
  it.each([
    ['2027-03-02', 'upcoming'], // the day before the first day
    ['2027-03-03', 'open'], // the first day is included
    ['2027-03-05', 'open'], // the last day is included
    ['2027-03-06', 'past'], // the day after
  ] as const)('on %s a visit from 3 to 5 March 2027 is %s', (today, phase) => {
    expect(visitPhase(today, visit)).toBe(phase)
  })
  it('a cancelled visit is never open, even inside its days', () => {
    expect(visitPhase('2027-03-04', { ...visit, cancelledAt: '2027-03-01T10:00:00Z' })).toBe(
      'cancelled',
    )
  })
})

describe('reminderDay', () => {
  it.each([
    // made 1 March, due 20 March, 3 days before: 17 March
    ['2027-03-01', '2027-03-20', 3, '2027-03-17'],
    // across a month end: due 2 April, 3 days before is 30 March (March has 31 days)
    ['2027-03-01', '2027-04-02', 3, '2027-03-30'],
    // across a leap day: due 2 March 2028, 3 days before is 28 February (2028 has 29 Feb)
    ['2028-02-01', '2028-03-02', 3, '2028-02-28'],
    // due 3 days after it was made: the reminder day would be the day it was made, so none
    ['2027-03-01', '2027-03-04', 3, null],
    // due the next day: none
    ['2027-03-01', '2027-03-02', 3, null],
  ])('made %s, due %s, %i days before: %s', (made, due, days, expected) => {
    expect(reminderDay(made, due, days)).toBe(expected)
  })
  it('adds days across a year end', () => {
    expect(addDaysIso('2027-12-30', 3)).toBe('2028-01-02')
  })
})

describe('canMoveTo', () => {
  it.each([
    ['open', 'accepted', true],
    ['open', 'declined', true],
    ['open', 'done', true],
    ['accepted', 'done', true],
    ['accepted', 'declined', true],
    ['accepted', 'accepted', false],
    ['declined', 'accepted', false],
    ['done', 'declined', false],
  ] as const)('%s → %s: %s', (from, to, allowed) => {
    expect(canMoveTo(from, to)).toBe(allowed)
  })
})
