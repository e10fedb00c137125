import { describe, expect, it } from 'vitest'
import type { Discipline } from '../../shared/domain/club.ts'
import {
  ageInYear,
  categoryChangesWithin,
  categoryFor,
  defaultAgeThresholds,
  type AgeCategory,
  type AgeThresholdTable,
} from '../../shared/domain/age-categories.ts'

const wag = 'FIG Technical Regulations 2025, Section 1, 6.1 — from memory'
const otherDisciplines = 'FIG Technical Regulations 2025, Section 1 — from memory'

describe('ageInYear', () => {
  it.each([
    // The calendar-year rule: the age turned during the year, whatever the birthday.
    [2010, 2026, 16, wag],
    [2010, 2025, 15, wag],
    [2013, 2025, 12, wag],
  ])('born %i, in %i the athlete counts as %i (%s)', (birthYear, year, age) => {
    expect(ageInYear(birthYear, year)).toBe(age)
  })
})

describe('categoryFor', () => {
  it.each<[Discipline, number, number, AgeCategory, string]>([
    ['artistic-women', 2012, 2025, 'age-group', `${wag}: 13 is below the junior band`],
    ['artistic-women', 2011, 2025, 'junior', `${wag}: juniors 14–15`],
    ['artistic-women', 2010, 2025, 'junior', `${wag}: juniors 14–15`],
    ['artistic-women', 2010, 2026, 'senior', `${wag}: seniors from the year of the 16th birthday`],
    ['artistic-women', 1995, 2025, 'senior', `${wag}: no upper age limit`],
    ['artistic-men', 2008, 2025, 'junior', `${otherDisciplines}: juniors 14–17`],
    ['artistic-men', 2007, 2025, 'senior', `${otherDisciplines}: seniors from 18`],
    ['tumbling', 2012, 2025, 'junior', `${otherDisciplines}: juniors 13–16`],
    ['trampoline', 2009, 2025, 'junior', `${otherDisciplines}: juniors 13–16`],
    ['trampoline', 2008, 2025, 'senior', `${otherDisciplines}: seniors from 17`],
  ])('%s, born %i, in %i: %s (%s)', (discipline, birthYear, year, category) => {
    expect(categoryFor(discipline, birthYear, year)).toBe(category)
  })

  it('follows thresholds the club configured', () => {
    const club: AgeThresholdTable = {
      ...defaultAgeThresholds,
      'artistic-women': { juniorFromAge: 13, seniorFromAge: 17, source: 'national rules' },
    }
    expect(categoryFor('artistic-women', 2012, 2025, club)).toBe('junior')
    expect(categoryFor('artistic-women', 2009, 2025, club)).toBe('junior')
    expect(categoryFor('artistic-women', 2009, 2025)).toBe('senior')
  })
})

describe('categoryChangesWithin', () => {
  it.each<{
    name: string
    birthYear: number
    discipline: Discipline
    asOf: string
    horizonMonths?: number
    expected: ReturnType<typeof categoryChangesWithin>
  }>([
    {
      // wag: turns 16 in 2026, so senior from 1 January 2026
      name: 'a junior turning 16 next year becomes a senior on 1 January',
      birthYear: 2010,
      discipline: 'artistic-women',
      asOf: '2025-09-15',
      expected: { from: 'junior', to: 'senior', startsOn: '2026-01-01', ageInYear: 16 },
    },
    {
      // wag: turns 14 in 2026
      name: 'an age-group gymnast turning 14 next year becomes a junior',
      birthYear: 2012,
      discipline: 'artistic-women',
      asOf: '2025-09-15',
      expected: { from: 'age-group', to: 'junior', startsOn: '2026-01-01', ageInYear: 14 },
    },
    {
      // wag: 15 in 2026 is still junior; the senior year 2027 is beyond 12 months
      name: 'a first-year junior has no change within 12 months',
      birthYear: 2011,
      discipline: 'artistic-women',
      asOf: '2025-09-15',
      expected: null,
    },
    {
      name: 'a longer horizon reaches the change after next year',
      birthYear: 2011,
      discipline: 'artistic-women',
      asOf: '2025-09-15',
      horizonMonths: 24,
      expected: { from: 'junior', to: 'senior', startsOn: '2027-01-01', ageInYear: 16 },
    },
    {
      name: 'a change on the last day of the horizon counts',
      birthYear: 2010,
      discipline: 'artistic-women',
      asOf: '2025-01-01',
      expected: { from: 'junior', to: 'senior', startsOn: '2026-01-01', ageInYear: 16 },
    },
    {
      // 31 March + 9 months is 31 December, the day before the change
      name: 'a change the day after the horizon does not count',
      birthYear: 2010,
      discipline: 'artistic-women',
      asOf: '2025-03-31',
      horizonMonths: 9,
      expected: null,
    },
    {
      name: 'a category that started this 1 January is current, not coming',
      birthYear: 2010,
      discipline: 'artistic-women',
      asOf: '2026-01-01',
      expected: null,
    },
    {
      // otherDisciplines: men's seniors from 18
      name: "a men's junior turning 18 becomes a senior",
      birthYear: 2008,
      discipline: 'artistic-men',
      asOf: '2025-06-01',
      expected: { from: 'junior', to: 'senior', startsOn: '2026-01-01', ageInYear: 18 },
    },
  ])('$name', ({ birthYear, discipline, asOf, horizonMonths, expected }) => {
    expect(categoryChangesWithin(birthYear, discipline, asOf, horizonMonths)).toEqual(expected)
  })
})

describe('the seeded thresholds say where they come from', () => {
  it.each(Object.keys(defaultAgeThresholds) as Discipline[])(
    '%s names the FIG Technical Regulations and that it is from memory',
    (discipline) => {
      const { source } = defaultAgeThresholds[discipline]
      expect(source).toMatch(/^FIG Technical Regulations 2025, Section 1/)
      expect(source).toContain('from memory')
    },
  )
})

describe('dates of years below 1000 keep four digits (ISO 8601)', () => {
  // ISO 8601 writes a calendar year with four digits, 0998 not 998; the dates compared as text
  // must do the same. Women's artistic juniors from 14 (wag, from memory).
  it('finds a change on 1 January 0999, written so', () => {
    // born 985: 13 in 998 (age group), 14 in 999 (junior)
    expect(categoryChangesWithin(985, 'artistic-women', '0998-06-15')).toEqual({
      from: 'age-group',
      to: 'junior',
      startsOn: '0999-01-01',
      ageInYear: 14,
    })
  })

  it('ends a short horizon within its own year', () => {
    // born 984: 14 in 998; as of 0997-03-01 two months reach 0997-05-01, before 0998-01-01
    expect(categoryChangesWithin(984, 'artistic-women', '0997-03-01', 2)).toBeNull()
  })
})
