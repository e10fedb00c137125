import { expect, type Page } from '@playwright/test'
import { demoPeople } from '../../seed/demo.ts'
import { familyNames, givenNames } from '../../seed/names.ts'
import { mainNav } from './support-auth.ts'

/** Runs an audit of the whole club as of today from the Audits page; returns its report's path. */
export async function runClubAudit(page: Page) {
  await mainNav(page).getByRole('link', { name: 'Audits' }).click()
  await page.locator('[data-test="run-audit"]').click()
  await expect(page).toHaveURL(/\/audits\/[0-9a-f-]{36}$/, { timeout: 30_000 })
  await expect(reportCard(page, 'Headline figures')).toBeVisible()
  return new URL(page.url()).pathname
}

/**
 * One card of the report or the board summary, by the title in its header. (Naive UI gives the
 * card header a heading role of its own, so the title is looked up as the h2 inside it.)
 */
export const reportCard = (page: Page, title: string | RegExp) =>
  page.locator('.n-card').filter({ has: page.locator('h2', { hasText: title }) })

/** Publishes the open report to the board, through its confirmation dialog. */
export async function publishAudit(page: Page) {
  await page.locator('[data-test="publish"]').click()
  await page.getByRole('dialog').getByRole('button', { name: 'Publish' }).click()
  await expect(page.getByText(/^\s*published \d{4}-\d{2}-\d{2}\s*$/)).toBeVisible()
}

// Staff of the demo club carry some of the family names the athletes are drawn from; the
// board may see staff (its own member's name is on the account button), so for those family
// names only the athletes' full names are looked for.
const staffWords = new Set(demoPeople.flatMap((p) => p.name.split(' ')))
const athleteOnlyFamilyNames = familyNames.filter((n) => !staffWords.has(n))
const sharedFamilyNames = familyNames.filter((n) => staffWords.has(n))

/** Whole-word patterns for every name the demo athletes are drawn from (seed/names.ts). */
export const demoAthleteNamePatterns: RegExp[] = [
  ...givenNames.map((n) => new RegExp(`\\b${n}\\b`)),
  ...athleteOnlyFamilyNames.map((n) => new RegExp(`\\b${n}\\b`)),
  ...sharedFamilyNames.map((n) => new RegExp(`\\b(?:${givenNames.join('|')}) ${n}\\b`)),
]

/** The demo athlete names found in a text, as the patterns that matched it. */
export const demoAthleteNamesIn = (text: string) =>
  demoAthleteNamePatterns.filter((p) => p.test(text)).map((p) => p.source)

/** True when the name is one the seed gives demo athletes: a given name and a family name. */
export function isDemoAthleteName(name: string) {
  const [given, family, ...rest] = name.trim().split(/\s+/)
  return (
    rest.length === 0 &&
    (givenNames as readonly string[]).includes(given ?? '') &&
    (familyNames as readonly string[]).includes(family ?? '')
  )
}
