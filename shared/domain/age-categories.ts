// Competitive age categories. The FIG counts age by calendar year: an athlete's age for a season
// is the age they turn during that year, whatever the day of their birthday. That is why Twofold
// stores only the birth year, and why a category always changes on 1 January.

import type { Discipline } from './club.ts'

/** Below the junior band an athlete competes in age-group programmes. */
export const ageCategories = ['age-group', 'junior', 'senior'] as const
export type AgeCategory = (typeof ageCategories)[number]

export interface AgeThresholds {
  /** Age in the year (see {@link ageInYear}) from which the athlete is a junior. */
  juniorFromAge: number
  /** Age in the year from which the athlete is a senior; the junior band ends the year before. */
  seniorFromAge: number
  /** Where the thresholds come from. */
  source: string
}

export type AgeThresholdTable = Record<Discipline, AgeThresholds>

/**
 * Seeded defaults; a club may configure its own. Only the women's artistic band is known with
 * some confidence; the others are marked "from memory" and should be checked against the current
 * FIG Technical Regulations before they are relied on.
 */
export const defaultAgeThresholds: AgeThresholdTable = {
  'artistic-women': {
    juniorFromAge: 14,
    seniorFromAge: 16,
    source:
      'FIG Technical Regulations 2025, Section 1, 6.1 — from memory: juniors 14–15, seniors from the year of the 16th birthday',
  },
  'artistic-men': {
    juniorFromAge: 14,
    seniorFromAge: 18,
    source:
      'FIG Technical Regulations 2025, Section 1 — from memory: juniors 14–17, seniors from the year of the 18th birthday',
  },
  tumbling: {
    juniorFromAge: 13,
    seniorFromAge: 17,
    source:
      'FIG Technical Regulations 2025, Section 1 — from memory: juniors 13–16, seniors from the year of the 17th birthday',
  },
  trampoline: {
    juniorFromAge: 13,
    seniorFromAge: 17,
    source:
      'FIG Technical Regulations 2025, Section 1 — from memory: juniors 13–16, seniors from the year of the 17th birthday',
  },
}

/** The age an athlete born in `birthYear` turns during `year`: the FIG calendar-year rule. */
export function ageInYear(birthYear: number, year: number): number {
  return year - birthYear
}

/** The athlete's category for the whole of `year`. */
export function categoryFor(
  discipline: Discipline,
  birthYear: number,
  year: number,
  thresholds: AgeThresholdTable = defaultAgeThresholds,
): AgeCategory {
  const age = ageInYear(birthYear, year)
  const band = thresholds[discipline]
  if (age >= band.seniorFromAge) return 'senior'
  if (age >= band.juniorFromAge) return 'junior'
  return 'age-group'
}

export interface CategoryChange {
  from: AgeCategory
  to: AgeCategory
  /** 1 January of the year the new category starts (ISO date). */
  startsOn: string
  /** The age the athlete turns in that year. */
  ageInYear: number
}

/** `isoDate` plus whole months, the day clamped to the end of a shorter month. */
function addMonths(isoDate: string, months: number): string {
  const [y = 0, m = 1, d = 1] = isoDate.split('-').map(Number)
  const monthIndex = y * 12 + (m - 1) + months
  const year = Math.floor(monthIndex / 12)
  // Stryker disable next-line ArithmeticOperator: equivalent, the horizon end is only compared with 1 January of a year, so only its year counts
  const month = monthIndex - year * 12
  // Stryker disable next-line ArithmeticOperator: equivalent, only the year of the horizon end counts (see above)
  const lastDay = new Date(Date.UTC(year, month + 1, 0)).getUTCDate()
  // Stryker disable next-line MethodExpression: equivalent, only the year of the horizon end counts (see above)
  const day = Math.min(d, lastDay)
  return `${String(year).padStart(4, '0')}-${String(month + 1).padStart(2, '0')}-${String(day).padStart(2, '0')}`
}

/**
 * The next category change after `asOf` if it starts within `horizonMonths` (inclusive: a change
 * on the last day of the horizon counts), otherwise null. A change on 1 January of the year of
 * `asOf` has already happened and is the current category, not a change to come.
 */
export function categoryChangesWithin(
  birthYear: number,
  discipline: Discipline,
  asOf: string,
  horizonMonths = 12,
  thresholds: AgeThresholdTable = defaultAgeThresholds,
): CategoryChange | null {
  const year = Number(asOf.slice(0, 4))
  const horizonEnd = addMonths(asOf, horizonMonths)
  const from = categoryFor(discipline, birthYear, year, thresholds)
  for (let next = year + 1; `${String(next).padStart(4, '0')}-01-01` <= horizonEnd; next++) {
    const to = categoryFor(discipline, birthYear, next, thresholds)
    if (to !== from) {
      return {
        from,
        to,
        startsOn: `${String(next).padStart(4, '0')}-01-01`,
        ageInYear: ageInYear(birthYear, next),
      }
    }
  }
  return null
}
