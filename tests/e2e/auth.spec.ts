import { expect, test } from '@playwright/test'
import { expectNoSeriousAxeViolations, openMailTo, screenshot } from './support.ts'
import { mainNav, signIn, signOut } from './support-auth.ts'

test('a signed-out visitor is sent to sign-in', async ({ page }) => {
  await page.goto('/members')
  await expect(page).toHaveURL(/\/sign-in\?next=\/members/)
  await expect(page.getByRole('button', { name: 'Sign in' })).toBeVisible()
  await screenshot(page, 'sign-in')
})

test('a wrong password is refused with a readable message', async ({ page }) => {
  await page.goto('/sign-in')
  await page.getByLabel('E-mail').fill('director@demo.example')
  await page.getByLabel('Password').fill('not the password')
  await page.getByRole('button', { name: 'Sign in' }).click()
  await expect(page.getByRole('alert')).toContainText('do not match an account')
})

const roles = [
  {
    email: 'director@demo.example',
    sees: ['Overview', 'Members'],
    hidden: [] as string[],
  },
  { email: 'coach@demo.example', sees: ['Overview'], hidden: ['Members'] },
  { email: 'clinician@demo.example', sees: ['Your visit'], hidden: ['Members', 'Overview'] },
  { email: 'board@demo.example', sees: ['Board summary'], hidden: ['Members', 'Overview'] },
]

for (const role of roles) {
  test(`${role.email} signs in and sees their own navigation`, async ({ page }) => {
    await signIn(page, role.email)
    for (const label of role.sees)
      await expect(mainNav(page).getByRole('link', { name: label })).toBeVisible()
    for (const label of role.hidden)
      await expect(mainNav(page).getByRole('link', { name: label })).toHaveCount(0)
    await screenshot(page, `home-${role.email.split('@')[0]}`)
    if (role.hidden.includes('Members')) {
      await page.goto('/members')
      await expect(page.getByText('This page is not for your role')).toBeVisible()
    }
    await signOut(page)
  })
}

test('an invitation is accepted end to end with the link from the local mail viewer', async ({
  page,
}) => {
  const invitee = `new.coach.${Date.now()}@demo.example`
  await signIn(page, 'director@demo.example')
  await mainNav(page).getByRole('link', { name: 'Members' }).click()
  await expect(page.getByText('People in the club')).toBeVisible()
  await page.locator('input[name="invite-email"]').fill(invitee)
  await page.getByRole('button', { name: 'Send invitation' }).click()
  await expect(page.getByText(`Invitation sent to ${invitee}.`)).toBeVisible()
  // Without a mail provider the page says where the demo's mail goes.
  const viewerLink = page.getByRole('link', { name: 'local mail viewer' })
  await expect(viewerLink).toBeVisible()
  const viewerUrl = await viewerLink.getAttribute('href')
  expect(new URL(viewerUrl!).hostname).toBe('127.0.0.1')
  await screenshot(page, 'members')

  const message = await openMailTo(page, viewerUrl!, invitee)
  const link = await message.getByRole('link').first().getAttribute('href')
  expect(link).toMatch(/\/accept-invitation#token=/)
  await expectNoSeriousAxeViolations(page)
  await screenshot(page, 'local-mail')
  await page.goto('/')
  await signOut(page)

  await page.goto(link!)
  await expect(page.getByText('invites')).toContainText(invitee)
  await page.getByLabel('Your name').fill('Noor Quarrington')
  await page.getByLabel('Choose a password').fill('marigold-quiver-basalt-62')
  await page.getByRole('button', { name: 'Accept and sign in' }).click()
  await expect(page.getByText('Welcome, Noor Quarrington.')).toBeVisible()
  await expect(page.getByText('as coach')).toBeVisible()
  await screenshot(page, 'invitation-accepted')
})

test('the shell works on a tablet-sized screen', async ({ browser }) => {
  const context = await browser.newContext({ viewport: { width: 768, height: 1024 } })
  const page = await context.newPage()
  await signIn(page, 'director@demo.example')
  await page.getByRole('button', { name: 'Open the menu' }).click()
  await expect(page.getByRole('dialog').getByRole('link', { name: 'Members' })).toBeVisible()
  await screenshot(page, 'tablet-menu')
  await context.close()
})
