import { expect, test, type Page } from '@playwright/test'
import { standardCatalogue } from '../../shared/domain/standard-catalogue.ts'
import { expectNoSeriousAxeViolations, openMailTo, screenshot } from './support.ts'

/** The confirmation link of the newest message to `email`, read in the local mail viewer. */
async function linkFromMailViewer(page: Page, email: string) {
  const viewerLink = page.getByRole('link', { name: 'local mail viewer' })
  await expect(viewerLink).toBeVisible()
  const viewerUrl = await viewerLink.getAttribute('href')
  expect(new URL(viewerUrl!).hostname).toBe('127.0.0.1')
  const message = await openMailTo(page, viewerUrl!, email)
  const link = await message.getByRole('link').first().getAttribute('href')
  expect(link).toMatch(/\/confirm-club#token=/)
  return link!
}

test('a person starts a club from the sign-in page and lands on its catalogue as director', async ({
  page,
}) => {
  const email = `ines.${Date.now()}@lowfield.example`
  await page.goto('/sign-in')
  await page.getByRole('link', { name: 'Start a club' }).click()
  await expect(page).toHaveURL(/\/start-club$/)
  await expect(page.getByRole('heading', { name: 'Start a club', level: 1 })).toBeVisible()
  await expectNoSeriousAxeViolations(page)
  await screenshot(page, 'start-club')

  await page.getByLabel('Club name').fill('Lowfield Tumbling Club')
  await page.getByLabel('Your name').fill('Ines Marwick')
  await page.getByLabel('Your e-mail').fill(email)
  await page.getByRole('button', { name: 'Send the confirmation link' }).click()
  await expect(page.getByText(`A confirmation link is on its way to ${email}.`)).toBeVisible()
  await screenshot(page, 'start-club-sent')

  const link = await linkFromMailViewer(page, email)
  await page.goto(link)
  const summary = page.locator('[data-test="signup-summary"]')
  await expect(summary).toContainText('Lowfield Tumbling Club')
  await expect(summary).toContainText(email)
  // The token is taken off the address bar once read.
  await expect(page).toHaveURL(/\/confirm-club$/)
  await expectNoSeriousAxeViolations(page)
  await screenshot(page, 'confirm-club')

  await page.getByLabel('Choose a password').fill('password1')
  await page.getByRole('button', { name: 'Start the club and sign in' }).click()
  await expect(page.getByText('This password is too easy to guess.')).toBeVisible()
  await page.getByLabel('Choose a password').fill('quill-harbour-sorrel-58')
  await page.getByRole('button', { name: 'Start the club and sign in' }).click()

  await expect(page).toHaveURL(/\/catalogue$/)
  await expect(page.getByRole('heading', { name: 'Catalogue', level: 1 })).toBeVisible()
  await expect(page.getByRole('link', { name: 'New element' })).toBeVisible()
  await expect(page.getByText('No gaps: every forward and backward element')).toBeVisible()
  await page.getByLabel('Search name or notation').fill('Back handspring')
  await expect(page.getByRole('cell', { name: 'Back handspring' }).first()).toBeVisible()
  await page.getByLabel('Search name or notation').fill('')
  // The club holds the whole standard catalogue, as its director's session reads it.
  const me = await (await page.request.get('/api/auth/me')).json()
  expect(me.memberships).toEqual([
    expect.objectContaining({ clubName: 'Lowfield Tumbling Club', role: 'director' }),
  ])
  const listed = await page.request.get(`/api/clubs/${me.activeClubId}/elements`)
  expect(await listed.json()).toHaveLength(standardCatalogue.length)
  await screenshot(page, 'new-club-catalogue')

  // The link worked once.
  await page.goto(link)
  await expect(page.getByRole('alert')).toContainText('already used')
  await expect(page.getByRole('link', { name: 'Start a club again' })).toBeVisible()
})

test('the Start a club form works by keyboard on a tablet-sized screen', async ({ browser }) => {
  const context = await browser.newContext({ viewport: { width: 768, height: 1024 } })
  const page = await context.newPage()
  const email = `kit.${Date.now()}@harbour.example`
  await page.goto('/start-club')
  await page.getByRole('button', { name: 'Send the confirmation link' }).focus()
  await page.keyboard.press('Enter')
  await expect(page.getByText('Enter the club name (at least 2 characters).')).toBeVisible()
  await page.getByLabel('Club name').focus()
  await page.keyboard.type('Harbour Flyers')
  await page.keyboard.press('Tab')
  await page.keyboard.type('Kit Harbour')
  await page.keyboard.press('Tab')
  await page.keyboard.type(email)
  await page.keyboard.press('Enter')
  await expect(page.getByText(`A confirmation link is on its way to ${email}.`)).toBeVisible()
  await screenshot(page, 'start-club-tablet')
  await context.close()
})
