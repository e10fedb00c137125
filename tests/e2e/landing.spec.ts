import { expect, test, type Page } from '@playwright/test'
import { demoPeople, demoSquads } from '../../seed/demo.ts'
import { screenshot } from './support.ts'
import { mainNav, signIn } from './support-auth.ts'

// Each role lands on a page of its own, and the director's whole navigation (Members included)
// stands in one row at 1440 px, with no overflow menu. Screenshots at 1440 px and at a tablet's
// 768 px for people to look at.
test.use({ viewport: { width: 1440, height: 900 } })

const email = (role: string) => demoPeople.find((p) => p.role === role)!.email

async function shoot(page: Page, name: string) {
  await screenshot(page, `landing-${name}-1440`)
  await page.setViewportSize({ width: 768, height: 1024 })
  await expect(page.getByRole('button', { name: 'Open the menu' })).toBeVisible()
  await screenshot(page, `landing-${name}-768`)
}

test('the director lands on the club state, with every navigation entry in view at 1440 px', async ({
  page,
}) => {
  await signIn(page, email('director'))
  await expect(page).toHaveURL(/\/$/)
  for (const label of ['Overview', 'Catalogue', 'Squads', 'Audits', 'Members', 'Club'])
    await expect(mainNav(page).getByRole('link', { name: label, exact: true })).toBeVisible()
  // The demo has four published club-wide audits: the latest is there with its report.
  await expect(page.locator('[data-test="home-latest-audit"]')).toContainText('as of')
  await expect(page.locator('[data-test="home-readiness"]')).toContainText('published as of')
  await expect(page.getByRole('heading', { name: 'Catalogue gaps to fix' })).toBeVisible()
  await expect(
    page.locator('[data-test="home-catalogue-gaps"]').or(page.getByText('Every backward element')),
  ).toBeVisible()
  await shoot(page, 'director')
  await page.setViewportSize({ width: 1440, height: 900 })
  await page.getByRole('button', { name: 'Open the report' }).click()
  await expect(page).toHaveURL(/\/audits\/[0-9a-f-]{36}$/)
})

test('the coach lands on their own squads and who is due a log', async ({ page }) => {
  const coach = demoPeople.find((p) => p.email === 'coach@demo.example')!
  await signIn(page, coach.email)
  const squads = page.locator('[data-test="home-squads"]')
  for (const name of coach.squads!) await expect(squads).toContainText(name)
  for (const other of demoSquads.filter((s) => !coach.squads!.includes(s.name)))
    await expect(squads).not.toContainText(other.name)
  await expect(
    page.getByRole('heading', { name: /^Due: nothing logged for 28 days/ }),
  ).toBeVisible()
  await shoot(page, 'coach')
})

test('the clinician lands on their visit: its dates and the squads it covers', async ({ page }) => {
  await signIn(page, email('clinician'))
  await expect(page).toHaveURL(/\/visit$/)
  await expect(page.getByRole('heading', { level: 1 })).toContainText('Your visit')
  // The demo's open visit covers the Kites alone (seed/demo-visits.ts).
  const visit = page.locator('[data-test="clinician-visit"]').first()
  await expect(visit).toContainText(/\d{4}-\d{2}-\d{2} – \d{4}-\d{2}-\d{2}/)
  await expect(visit.getByRole('link', { name: 'Kites' })).toBeVisible()
  for (const other of demoSquads.filter((s) => s.name !== 'Kites'))
    await expect(visit.getByRole('link', { name: other.name })).toHaveCount(0)
  // The figures above the squad-limited gap list are the covered squad's; the club's own average
  // only as context, labelled as such.
  const squadLags = page.locator('[data-test="covered-squad-lags"]')
  await expect(squadLags).toContainText('Kites:')
  for (const other of demoSquads.filter((s) => s.name !== 'Kites'))
    await expect(squadLags).not.toContainText(`${other.name}:`)
  await expect(page.locator('[data-test="club-lag"]')).toContainText(/the whole (club|squad)/)
  await shoot(page, 'clinician')
})

test('the board lands on its summary', async ({ page }) => {
  await signIn(page, email('board'))
  await expect(page).toHaveURL(/\/board$/)
  await expect(page.getByRole('heading', { level: 1 })).toContainText('Board summary')
  await shoot(page, 'board')
})
